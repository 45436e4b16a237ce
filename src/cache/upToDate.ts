/**
 * The up-to-date stamp: what the last successful build was asked for, every file it read with
 * that file's identity, the site folder it left and what it reported. When all of that still
 * holds and every site file is as the manifest recorded it, a rebuild would write the same
 * bytes, so `build` only repeats the report: no catalog, no templates, no pipeline loaded.
 * Any doubt (a file listed, removed, touched or edited, other options, another program) means
 * a full build, which removes the stamp before it starts and writes a new one when it succeeds.
 */
import { readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { Diagnostic } from '../diagnostics.js';
import { readManifest, verifiedFiles } from '../write/manifest.js';
import { writeAtomically } from './atomicWrite.js';
import { type FileIdentity, identityOf, sameIdentity } from './identity.js';

export const STAMP_FILE = 'up-to-date.json';
const STAMP_VERSION = 1;

export interface FileRead {
  path: string;
  identity: FileIdentity;
}

/** A session as the build reported it (what the command line prints again). */
export interface StampedSession {
  file: string;
  id: string | null;
  ok: boolean;
  status: string;
  diagnostics: Diagnostic[];
  warnings: Diagnostic[];
}

export interface UpToDateStamp {
  version: number;
  /** Everything the build was asked for that is not a file: options, settings, the program. */
  key: string;
  /** The session files as listed, in order. */
  listing: string[];
  /** Every file read: sessions, profiles, the config, line lists, bundled data and templates. */
  read: FileRead[];
  /** The output folder as the build left it (a swap replaces it, so its inode changes). */
  site: FileIdentity;
  sessions: StampedSession[];
}

/** Identities of files about to be read (taken before reading, so a later edit shows). */
export function identitiesOf(paths: readonly string[]): FileRead[] {
  const out: FileRead[] = [];
  for (const path of paths) {
    const identity = identityOf(path);
    if (identity) out.push({ path, identity });
  }
  return out;
}

/** Written last by a successful build (atomically: a killed build leaves none). */
export function writeStamp(
  cacheDir: string,
  outDir: string,
  stamp: Omit<UpToDateStamp, 'version' | 'site'>,
): void {
  const site = identityOf(outDir, true);
  if (site === null) return;
  const path = join(cacheDir, STAMP_FILE);
  writeAtomically(path, JSON.stringify({ version: STAMP_VERSION, site, ...stamp } satisfies UpToDateStamp));
}

/** Before a build changes anything: the stamp no longer vouches for the site. */
export function removeStamp(cacheDir: string): void {
  rmSync(join(cacheDir, STAMP_FILE), { force: true });
}

function readStamp(cacheDir: string): UpToDateStamp | null {
  try {
    const s = JSON.parse(readFileSync(join(cacheDir, STAMP_FILE), 'utf8')) as UpToDateStamp;
    return s && s.version === STAMP_VERSION && Array.isArray(s.read) && Array.isArray(s.sessions) ? s : null;
  } catch {
    return null;
  }
}

const sameList = (a: readonly string[], b: readonly string[]) =>
  a.length === b.length && a.every((x, i) => x === b[i]);

/**
 * The sessions of the last build when nothing it depends on has changed since; else null.
 * Reads only the stamp, the manifest and the files' identities (no file contents).
 */
export function stillUpToDate(
  cacheDir: string,
  outDir: string,
  key: string,
  listing: readonly string[],
): StampedSession[] | null {
  const stamp = readStamp(cacheDir);
  if (stamp === null || stamp.key !== key || !sameList(stamp.listing, listing)) return null;
  if (!sameIdentity(identityOf(outDir, true), stamp.site)) return null;
  for (const f of stamp.read) if (!sameIdentity(identityOf(f.path), f.identity)) return null;
  const manifest = readManifest(join(cacheDir, 'site-manifest.json'), outDir);
  if (manifest === null) return null;
  if (verifiedFiles(manifest).size !== Object.keys(manifest.files).length) return null;
  return stamp.sessions;
}
