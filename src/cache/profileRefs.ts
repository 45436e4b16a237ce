/**
 * Which profile file each session names, remembered by the SHA-256 of the session's bytes.
 * Finding it means a YAML parse of every session (most of a rebuild's reading time on a
 * large archive); the answer is a pure function of the bytes, so a session whose bytes are
 * unchanged need not be parsed again. Kept in the cache folder, emptied with it when another
 * program opens the cache, and holding only the sessions of the last build.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeAtomically } from './atomicWrite.js';

export const PROFILE_REFS_FILE = 'profile-refs.json';

type Refs = Record<string, string | null>;

function readRefs(path: string): Refs {
  try {
    const data: unknown = JSON.parse(readFileSync(path, 'utf8'));
    if (data === null || typeof data !== 'object' || Array.isArray(data)) return {};
    const refs: Refs = {};
    for (const [k, v] of Object.entries(data))
      if (/^[0-9a-f]{64}$/.test(k) && (v === null || typeof v === 'string')) refs[k] = v;
    return refs;
  } catch {
    return {}; // Missing or damaged: every session is parsed again.
  }
}

export class ProfileRefMemo {
  private readonly path: string;
  private readonly known: Refs;
  private readonly used: Refs = {};
  private changed = false;

  /**
   * `parse` finds the profile a session names (session/profile/ref.ts profileFileOf); passed in
   * so that the cache, which every rebuild opens, does not load the YAML library itself.
   */
  constructor(
    cacheDir: string,
    private readonly parse: (bytes: Uint8Array) => string | null,
  ) {
    this.path = join(cacheDir, PROFILE_REFS_FILE);
    this.known = readRefs(this.path);
  }

  /** The profile file the session names, parsed only for new bytes. */
  refOf(bytes: Uint8Array): string | null {
    const hash = createHash('sha256').update(bytes).digest('hex');
    let ref = this.known[hash];
    if (ref === undefined) {
      ref = this.parse(bytes);
      this.changed = true;
    }
    this.used[hash] = ref;
    return ref;
  }

  /** Keeps the sessions of this build only; written when anything differs from what was read. */
  save(): void {
    const stale = Object.keys(this.known).some((k) => !(k in this.used));
    if (!this.changed && !stale) return;
    writeAtomically(this.path, JSON.stringify(this.used));
  }
}
