import { mkdirSync, mkdtempSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readProfileInput } from '../../src/input/sessionFiles.js';
import { profileFileOf } from '../../src/session/profile/ref.js';
import { readSessionText } from '../../src/session/read.js';
import { fitsFile, primary } from './fitsWriter.js';

const profileCsv = Array.from({ length: 40 }, (_, i) => `${i},${100 + (i === 20 ? 500 : 0)}`).join('\n');

function session(profile: string, extra = '') {
  return `lineledger: 1
source: { kind: lamp }
${extra}measurement:
  method: pixel
  calibration:
    lines:
      - { pixel: 0, wavelength: 400 }
      - { pixel: 20, wavelength: 500 }
      - { pixel: 39, wavelength: 595 }
profile:
  file: ${profile}
`;
}

function folder(): string {
  const dir = mkdtempSync(join(tmpdir(), 'profile-'));
  mkdirSync(join(dir, 'sessions'));
  writeFileSync(join(dir, 'sessions', 'p.csv'), profileCsv);
  writeFileSync(join(dir, 'outside.csv'), profileCsv);
  return dir;
}

function read(dir: string, text: string) {
  const path = join(dir, 'sessions', 's.yaml');
  writeFileSync(path, text);
  const bytes = new TextEncoder().encode(text);
  return readSessionText(bytes, path, { profile: readProfileInput(path, bytes, profileFileOf) });
}

describe('a session names its profile', () => {
  it('beside it: the profile is read and checked', () => {
    const r = read(folder(), session('p.csv'));
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.value.profile?.data.x.length).toBe(40);
      expect(r.value.profile?.kind).toBe('emission');
      expect(r.value.profile?.threshold_sigma).toBe(5);
    }
  });
  it('outside its folder (.., absolute, or a link): refused, at profile.file', () => {
    const dir = folder();
    symlinkSync(join(dir, 'outside.csv'), join(dir, 'sessions', 'link.csv'));
    for (const name of ['../outside.csv', join(dir, 'outside.csv'), 'link.csv']) {
      const r = read(dir, session(name));
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.diagnostics[0]?.code).toBe('profile-outside');
        expect(r.diagnostics[0]?.field).toBe('profile.file');
        expect(r.diagnostics[0]?.line).toBe(11);
      }
    }
  });
  it('a missing file is a problem that names it', () => {
    const r = read(folder(), session('nope.csv'));
    expect(!r.ok && r.diagnostics[0]?.code).toBe('profile-missing');
  });
  it('lines and a profile together, or neither, are refused', () => {
    const both = read(folder(), `${session('p.csv')}lines:\n  - { pixel: 3 }\n`);
    expect(!both.ok && both.diagnostics.map((d) => d.code)).toContain('conflicting-keys');
    const neither = readSessionText('lineledger: 1\n', 's.yaml');
    expect(!neither.ok && neither.diagnostics.map((d) => d.code)).toContain('missing-key');
  });
  it("a FITS file's CTYPE1 sets the medium (Greisen et al. 2006), and a contrary medium: is an error", () => {
    const dir = folder();
    const cards = primary(-32, 40, [
      ['CTYPE1', 'AWAV'],
      ['CUNIT1', 'nm'],
      ['CRVAL1', 500],
      ['CRPIX1', 1],
      ['CDELT1', 0.1],
    ]);
    writeFileSync(join(dir, 'sessions', 'star.fits'), fitsFile(cards, -32, Array(40).fill(1)));
    const text =
      'lineledger: 1\nsource: { kind: star }\nmeasurement: { method: wavelength, sigma: 0.05 }\nprofile: { file: star.fits }\n';
    const ok = read(dir, text);
    expect(ok.ok && ok.value.medium).toBe('air');
    expect(ok.ok && ok.value.profile?.kind).toBe('absorption');
    const contrary = read(dir, text.replace('lineledger: 1\n', 'lineledger: 1\nmedium: vacuum\n'));
    expect(!contrary.ok && contrary.diagnostics[0]?.code).toBe('profile-medium');
    const pixelMethod = read(dir, session('star.fits'));
    expect(!pixelMethod.ok && pixelMethod.diagnostics[0]?.code).toBe('profile-axis');
  });
});

describe('finding the profile name before the full read', () => {
  it('names the profile file, or none', async () => {
    const { profileFileOf } = await import('../../src/session/profile/ref.js');
    const enc = (s: string) => new TextEncoder().encode(s);
    expect(profileFileOf(enc('lineledger: 1\nprofile: { file: a.csv }\n'))).toBe('a.csv');
    expect(profileFileOf(enc('lineledger: 1\nlines: []\n'))).toBeNull();
    expect(profileFileOf(enc('profile: { file: 3 }\n'))).toBeNull();
    expect(profileFileOf(enc('profile: [oops\n'))).toBeNull();
  });
});
