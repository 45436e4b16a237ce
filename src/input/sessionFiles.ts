/**
 * The read edge of a build: session files and the profiles they name, read with the guards
 * every command shares (no link out of the folder, no FIFO, a size limit checked before
 * reading). Each file read carries its identity on disk as it was when opened, so a build can
 * tell later whether anything it read has changed since (src/cache/upToDate.ts).
 */
import {
  closeSync,
  fstatSync,
  lstatSync,
  openSync,
  readdirSync,
  readSync,
  realpathSync,
  statSync,
} from 'node:fs';
import { dirname, isAbsolute, join, relative, resolve, sep } from 'node:path';
import { type FileIdentity, identityFromStats } from '../cache/identity.js';
import { type Diagnostic, escapeControls } from '../diagnostics.js';
import { SESSION_LIMITS } from '../session/limitValues.js';
import type { ProfileInput } from '../session/profile/types.js';

/** The session file names of a folder (links included: each is checked when read). */
export function listSessionFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true })
    .filter((e) => /\.ya?ml$/i.test(e.name) && !e.isDirectory())
    .map((e) => e.name)
    .sort()
    .map((n) => join(dir, n));
}

/** A session file's bytes, or the one problem that stops it being read. */
export type SessionInput =
  | { path: string; bytes: Uint8Array; identity: FileIdentity }
  | { path: string; problem: Diagnostic };

function inputProblem(path: string, code: string, message: string, hint: string): SessionInput {
  return {
    path,
    problem: { file: path, line: 1, col: 1, severity: 'error', code, field: '', message, hint },
  };
}

/** An open or read that failed: the system's error code, and what to check. */
function unreadable(path: string, e: unknown): SessionInput {
  return inputProblem(
    path,
    'unreadable',
    `cannot be read (${(e as NodeJS.ErrnoException).code ?? 'error'})`,
    'check the file and its permissions',
  );
}

/**
 * Reads one session file at the edge, safely: a link to nothing, a loop of links or a link
 * leaving `root` (the sessions folder; null: follow any) is a problem of that file; the size
 * is checked on the open file before a byte is read, and no more than the limit is read.
 * Returns null for what is no file at all (a folder named x.yaml), which is skipped as before.
 */
export function readSessionInput(
  path: string,
  root: string | null,
  maxBytes: number = SESSION_LIMITS.maxBytes,
): SessionInput | null {
  // A name that could drive the terminal or the page is refused before anything is read.
  const name = path.replace(/^.*[\\/]/, '');
  if (escapeControls(name) !== name)
    return inputProblem(
      path,
      'control-character',
      'the file name holds control characters',
      'rename the file to plain letters, digits and dashes',
    );
  let real: string;
  try {
    real = realpathSync(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ELOOP')
      return inputProblem(
        path,
        'link-loop',
        'is a symbolic link that leads round in a loop',
        'point the link at a session file, or remove it',
      );
    if (code === 'ENOENT')
      return inputProblem(
        path,
        'broken-link',
        'is a symbolic link to a file that does not exist',
        'point the link at a session file, or remove it',
      );
    return inputProblem(
      path,
      'unreadable',
      `cannot be read (${code ?? 'error'})`,
      'check the file and its permissions',
    );
  }
  if (root !== null) {
    const base = realpathSync(root);
    const rel = relative(base, real);
    if (rel === '' || rel === '..' || rel.startsWith(`..${sep}`) || isAbsolute(rel))
      return inputProblem(
        path,
        'link-outside',
        `is a symbolic link to ${real}, outside the sessions folder; it is not read`,
        'copy the file into the sessions folder instead of linking to it',
      );
  }
  let fd: number;
  try {
    const s = statSync(real);
    if (s.isDirectory()) return null;
    // A FIFO or device would block or never end: only regular files are opened.
    if (!s.isFile())
      return inputProblem(path, 'not-a-file', 'is not a regular file', 'session files are plain text files');
    fd = openSync(real, 'r');
  } catch (e) {
    return unreadable(path, e);
  }
  try {
    // Taken before reading: a file changed while it is read then differs from what was recorded.
    const identity = identityFromStats(fstatSync(fd));
    const size = identity.size;
    const tooLarge = (n: number) =>
      inputProblem(
        path,
        'file-too-large',
        `the file is ${n} bytes; the limit is ${maxBytes} bytes`,
        'a session is a few kilobytes: split it into several sessions, or move long notes elsewhere',
      );
    if (size > maxBytes) return tooLarge(size);
    // One byte more than the limit: a file that grew since fstat is still caught.
    const buf = Buffer.alloc(Math.min(size, maxBytes) + 1);
    let got = 0;
    for (let n = 1; n > 0 && got < buf.length; got += n) n = readSync(fd, buf, got, buf.length - got, got);
    if (got > maxBytes) return tooLarge(got);
    return { path, bytes: new Uint8Array(buf.buffer, buf.byteOffset, got), identity };
  } catch (e) {
    return unreadable(path, e);
  } finally {
    closeSync(fd);
  }
}

/** A profile is at most this big (a 1-D spectrum of a million float64 points is 8 MB). */
export const MAX_PROFILE_BYTES = 16 * 1024 * 1024;

/**
 * The profile file a session names, read at the edge with the same guard as session files:
 * the name is relative to the session's folder and may not leave it (by `..`, an absolute
 * path, or a link); the size is checked before reading. null when the session names none.
 * The file read, if any, is added to `read` with its identity.
 */
export function readProfileInput(
  sessionPath: string,
  sessionBytes: Uint8Array,
  /** Which profile the session names (session/profile/ref.ts profileFileOf, or a cache of it). */
  refOf: (bytes: Uint8Array) => string | null,
  read?: { path: string; identity: FileIdentity }[],
): ProfileInput | null {
  const name = refOf(sessionBytes);
  if (name === null) return null;
  const folder = dirname(resolve(sessionPath));
  const problem = (code: string, message: string, hint: string): ProfileInput => ({
    name,
    problem: { code, message, hint },
  });
  const target = resolve(folder, name);
  const rel = relative(folder, target);
  if (isAbsolute(name) || rel === '' || rel === '..' || rel.startsWith(`..${sep}`) || isAbsolute(rel))
    return problem(
      'profile-outside',
      `${name} is not inside the session's folder; it is not read`,
      'put the profile beside the session file (or in a folder below it) and name it relative to the session',
    );
  try {
    lstatSync(target);
  } catch {
    return problem(
      'profile-missing',
      `${name} does not exist beside the session`,
      'check the file name (it is relative to the session file)',
    );
  }
  const input = readSessionInput(target, folder, MAX_PROFILE_BYTES);
  if (input === null)
    return problem('profile-not-a-file', `${name} is a folder`, 'name the profile file itself');
  if ('problem' in input) {
    const p = input.problem;
    if (p.code === 'file-too-large')
      return problem(
        'profile-too-large',
        `${name}: ${p.message}`,
        'cut the profile to the range of interest, or bin it',
      );
    if (p.code === 'link-outside')
      return problem(
        'profile-outside',
        `${name} is a link to a file outside the session's folder; it is not read`,
        'copy the file beside the session instead of linking to it',
      );
    if (p.code === 'broken-link' || p.code === 'unreadable') {
      const missing = p.code === 'unreadable' && /ENOENT/.test(p.message);
      return problem(
        missing ? 'profile-missing' : `profile-${p.code}`,
        missing ? `${name} does not exist beside the session` : `${name} ${p.message}`,
        missing ? 'check the file name (it is relative to the session file)' : (p.hint ?? ''),
      );
    }
    return problem(`profile-${p.code}`, `${name} ${p.message}`, p.hint ?? '');
  }
  read?.push({ path: input.path, identity: input.identity });
  return { name, bytes: input.bytes };
}
