// The memo of which profile file a session names: the same answer as parsing the session,
// kept across builds only for the sessions of the last build, and harmless when damaged.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { PROFILE_REFS_FILE, ProfileRefMemo } from '../../src/cache/profileRefs.js';
import { profileFileOf } from '../../src/session/profile/ref.js';

const bytes = (text: string) => new TextEncoder().encode(text);
const withProfile = bytes('id: a\nprofile:\n  file: frame-1.csv\n');
const without = bytes('id: b\nlines: []\n');

describe('ProfileRefMemo', () => {
  it('answers as profileFileOf does, and remembers across builds', () => {
    const dir = mkdtempSync(join(tmpdir(), 'll-refs-'));
    const first = new ProfileRefMemo(dir, profileFileOf);
    expect(first.refOf(withProfile)).toBe(profileFileOf(withProfile));
    expect(first.refOf(without)).toBeNull();
    first.save();
    const stored = JSON.parse(readFileSync(join(dir, PROFILE_REFS_FILE), 'utf8'));
    expect(Object.values(stored).sort()).toEqual(['frame-1.csv', null]);
    // A second build sees the stored answers; a session no longer built is dropped.
    const second = new ProfileRefMemo(dir, profileFileOf);
    expect(second.refOf(withProfile)).toBe('frame-1.csv');
    second.save();
    expect(Object.values(JSON.parse(readFileSync(join(dir, PROFILE_REFS_FILE), 'utf8')))).toEqual([
      'frame-1.csv',
    ]);
  });

  it('parses again when the stored answers are damaged', () => {
    const dir = mkdtempSync(join(tmpdir(), 'll-refs-'));
    writeFileSync(join(dir, PROFILE_REFS_FILE), '{"not a hash": 3, broken');
    expect(new ProfileRefMemo(dir, profileFileOf).refOf(withProfile)).toBe('frame-1.csv');
  });
});
