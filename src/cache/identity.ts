/**
 * A file's identity on disk: inode, size, change and modification times. Any write to a file,
 * a rename over it or a touch changes at least one of them, and users cannot set the change
 * time, so an equal identity means the file was not touched since it was recorded. Cheaper
 * than reading and hashing it: what lets a build find out in milliseconds that nothing changed.
 */
import { type Stats, statSync } from 'node:fs';

export interface FileIdentity {
  size: number;
  ino: number;
  ctimeMs: number;
  mtimeMs: number;
}

export function identityFromStats(s: Stats): FileIdentity {
  return { size: s.size, ino: s.ino, ctimeMs: s.ctimeMs, mtimeMs: s.mtimeMs };
}

/** The identity of the file (or folder, with `folders`) at path; null when there is none. */
export function identityOf(path: string, folders = false): FileIdentity | null {
  try {
    const s = statSync(path);
    return s.isFile() || (folders && s.isDirectory()) ? identityFromStats(s) : null;
  } catch {
    return null;
  }
}

export function sameIdentity(a: FileIdentity | null, b: FileIdentity | null): boolean {
  return (
    a !== null &&
    b !== null &&
    a.size === b.size &&
    a.ino === b.ino &&
    a.ctimeMs === b.ctimeMs &&
    a.mtimeMs === b.mtimeMs
  );
}
