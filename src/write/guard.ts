/**
 * Before anything is replaced: is the folder a build would swap away (or a cache would empty)
 * one that lineledger may replace? Only a folder that is absent, empty, or recognisably one
 * lineledger wrote — never the user's sessions, their project, a git work tree, the folder
 * they stand in, or a file. The decision is pure (`decideTarget`); `probeTarget` and
 * `checkBuildTargets` gather the facts from disk at the edge.
 */
import {
  closeSync,
  existsSync,
  lstatSync,
  openSync,
  readdirSync,
  readSync,
  realpathSync,
  statSync,
} from 'node:fs';
import { basename, dirname, extname, isAbsolute, join, relative, resolve, sep } from 'node:path';
import { PROFILE_COPY } from '../report/profileCopy.js';

export type TargetRole = 'output' | 'cache';

/** What is on disk at a target, as far as the decision needs it. */
export interface TargetFacts {
  /** Absolute, with symbolic links of its existing ancestors resolved. */
  path: string;
  /** As the user named it (for messages). */
  shown: string;
  kind: 'absent' | 'folder' | 'file' | 'symlink' | 'other';
  empty: boolean;
  /** A site lineledger wrote (output) or a lineledger cache (cache). */
  recognised: boolean;
  /** The folder holds a `.git` entry: the root of a git work tree. */
  gitRoot: boolean;
}

/** A place the target must not be, contain, or (when `inside` is set) lie inside. */
export interface ProtectedPlace {
  path: string;
  what: string;
  inside: boolean;
}

export interface Refusal {
  role: TargetRole;
  shown: string;
  reason: string;
  hint: string;
}

/** Thrown by `checkBuildTargets` (the edge) so the command can turn it into exit 2. */
export class TargetRefused extends Error {
  constructor(readonly refusal: Refusal) {
    super(refusalMessage(refusal));
  }
}

const LABEL: Record<TargetRole, string> = { output: 'output folder', cache: 'cache folder' };

export function refusalMessage(r: Refusal): string {
  return `refusing the ${LABEL[r.role]} ${r.shown}: it ${r.reason}; nothing was changed. ${r.hint}`;
}

type Relation = 'same' | 'contains' | 'inside' | null;

/** How `a` stands to `b`: the same folder, an ancestor of it, below it, or apart. */
export function relation(a: string, b: string, caseInsensitive = false): Relation {
  const norm = (p: string) => (caseInsensitive ? p.toLowerCase() : p);
  const down = relative(norm(a), norm(b));
  if (down === '') return 'same';
  // relative() gives an absolute path between Windows drives: apart.
  const isBelow = (r: string) => r !== '' && r !== '..' && !r.startsWith(`..${sep}`) && !isAbsolute(r);
  if (isBelow(down)) return 'contains';
  if (isBelow(relative(norm(b), norm(a)))) return 'inside';
  return null;
}

const HINT: Record<TargetRole, string> = {
  output: 'Name a new or empty folder for the site, e.g. --out site (or out: site in lineledger.yaml).',
  cache: 'Name a new or empty folder for the cache, or leave --cache-dir out (or build with --no-cache).',
};

/** The pure decision: null when the target may be (re)placed, else why not. */
export function decideTarget(
  role: TargetRole,
  facts: TargetFacts,
  places: readonly ProtectedPlace[],
  caseInsensitive = false,
): Refusal | null {
  const refuse = (reason: string, hint = HINT[role]): Refusal => ({ role, shown: facts.shown, reason, hint });
  for (const place of places) {
    const r = relation(facts.path, place.path, caseInsensitive);
    // "not a lineledger cache" for a cache, as the cache store itself says.
    if (r === 'same') return refuse(`is ${place.what}${role === 'cache' ? ', not a lineledger cache' : ''}`);
    if (r === 'contains') return refuse(`contains ${place.what} (${place.path})`);
    if (r === 'inside' && place.inside)
      return refuse(
        `lies inside ${place.what} (${place.path})`,
        `Put it beside ${place.what} instead, e.g. ${join(dirname(place.path), role === 'output' ? 'site' : '.lineledger-cache')}.`,
      );
  }
  if (facts.kind === 'file') return refuse('is a file, not a folder');
  if (facts.kind === 'symlink')
    return refuse(
      'is a symbolic link (a build would replace the link itself)',
      'Name the folder it points to, or a new folder.',
    );
  if (facts.kind === 'other') return refuse('is not a regular folder');
  if (facts.kind === 'absent' || facts.empty) return null;
  if (facts.gitRoot) return refuse('is the root of a git work tree');
  if (!facts.recognised)
    return role === 'output'
      ? refuse(
          'is not empty and is not a site lineledger wrote (no build manifest or generator mark, or files a build does not write)',
          'Name a new or empty folder for the site; if it is an old site, move your own files out of it first.',
        )
      : refuse(
          'is not empty and is not a lineledger cache (no fingerprint file, or other files in it)',
          'Name a new or empty folder for the cache, or leave --cache-dir out (or build with --no-cache).',
        );
  return null;
}

// ---- disk probing (the edge) ----

/** Absolute, with links resolved as far as the path exists (the rest appended as given). */
export function canonicalPath(path: string): string {
  const abs = resolve(path);
  const rest: string[] = [];
  let at = abs;
  for (;;) {
    try {
      return join(realpathSync(at), ...rest.reverse());
    } catch {
      const up = dirname(at);
      if (up === at) return abs;
      rest.push(basename(at));
      at = up;
    }
  }
}

/** The root of the git work tree holding `dir`, if any (a folder with a `.git` entry). */
export function gitRootOf(dir: string): string | null {
  for (let at = canonicalPath(dir); ; ) {
    if (existsSync(join(at, '.git'))) return at;
    const up = dirname(at);
    if (up === at) return null;
    at = up;
  }
}

/** Files a site holds: what the build writes, and the records --pdf prints into it (and profile copies, PROFILE_COPY). */
const SITE_FILE = new Set(['.html', '.css', '.csv', '.json', '.svg', '.yaml', '.pdf']);
const GENERATOR = /<meta name="generator" content="lineledger[ "]/;

function readHead(path: string, bytes: number): string {
  try {
    const fd = openSync(path, 'r');
    try {
      const buf = Buffer.alloc(bytes);
      return buf.subarray(0, readSync(fd, buf, 0, bytes, 0)).toString('utf8');
    } finally {
      closeSync(fd);
    }
  } catch {
    return '';
  }
}

function walkFiles(dir: string, limit: number): string[] | null {
  const out: string[] = [];
  const walk = (d: string): boolean => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) {
        if (!walk(p)) return false;
      } else if (!e.isFile() || out.push(relative(dir, p).split(sep).join('/')) > limit) return false;
    }
    return true;
  };
  return walk(dir) ? out : null;
}

/**
 * A site lineledger wrote: its front page carries the generator mark, or a build manifest
 * names this folder; and it holds only files of the kinds a build writes (or the manifest
 * lists). A user's notes dropped into the site make it unrecognisable, so they are kept.
 */
function looksLikeOurSite(dir: string, manifestFiles: ReadonlySet<string> | null): boolean {
  const marked = GENERATOR.test(readHead(join(dir, 'index.html'), 4096));
  if (!marked && manifestFiles === null) return false;
  const files = walkFiles(dir, 1_000_000);
  if (files === null) return false;
  return files.every(
    (f) =>
      manifestFiles?.has(f) ||
      (SITE_FILE.has(extname(f).toLowerCase()) && !f.startsWith('.')) ||
      PROFILE_COPY.test(f),
  );
}

const CACHE_ENTRY =
  /^(sessions|charts|fingerprint|site-manifest\.json|up-to-date\.json|profile-refs\.json|index-pages\.json|.*\.tmp)$/;

function looksLikeOurCache(entries: readonly string[]): boolean {
  return entries.includes('fingerprint') && entries.every((e) => CACHE_ENTRY.test(e));
}

/** The files a build manifest lists for `out` (null when none names it). */
function manifestFilesFor(manifestPaths: readonly string[], out: string): Set<string> | null {
  for (const m of manifestPaths) {
    try {
      const parsed = JSON.parse(readHead(m, 64 * 1024 * 1024)) as { out?: unknown; files?: unknown };
      if (parsed && typeof parsed.files === 'object' && parsed.files !== null && parsed.out === resolve(out))
        return new Set(Object.keys(parsed.files));
    } catch {
      // An unreadable manifest names nothing.
    }
  }
  return null;
}

export function probeTarget(
  role: TargetRole,
  shown: string,
  manifestPaths: readonly string[] = [],
): TargetFacts {
  const path = canonicalPath(shown);
  const base = { path, shown, empty: false, recognised: false, gitRoot: false };
  let kind: TargetFacts['kind'];
  try {
    const l = lstatSync(resolve(shown));
    // A cache may sit behind a link (its files are written through it); a site is swapped by rename.
    const s = l.isSymbolicLink() && role === 'cache' ? statSync(resolve(shown)) : l;
    kind = s.isSymbolicLink() ? 'symlink' : s.isDirectory() ? 'folder' : s.isFile() ? 'file' : 'other';
  } catch (e) {
    // A link to nothing is a link; a path through a file (ENOTDIR) is no folder at all.
    const code = (e as NodeJS.ErrnoException).code;
    kind = code !== 'ENOENT' ? 'other' : lstatExists(shown) ? 'symlink' : 'absent';
  }
  if (kind !== 'folder') return { ...base, kind };
  const entries = readdirSync(path);
  if (entries.length === 0) return { ...base, kind, empty: true };
  const recognised =
    role === 'output'
      ? looksLikeOurSite(path, manifestFilesFor(manifestPaths, shown))
      : looksLikeOurCache(entries);
  return { ...base, kind, recognised, gitRoot: entries.includes('.git') };
}

function lstatExists(path: string): boolean {
  try {
    lstatSync(resolve(path));
    return true;
  } catch {
    return false;
  }
}

export interface BuildTargets {
  inputDir: string;
  outDir: string;
  /** null: no cache is kept. */
  cacheDir: string | null;
  /** The folder of lineledger.yaml, when one is used. */
  configDir?: string | null;
  /** Build manifests that may name the output folder. */
  manifestPaths?: readonly string[];
  cwd?: string;
}

const CASE_INSENSITIVE = process.platform === 'win32' || process.platform === 'darwin';

function placesFor(t: BuildTargets): ProtectedPlace[] {
  const cwd = canonicalPath(t.cwd ?? process.cwd());
  const sessions = canonicalPath(t.inputDir);
  const places: ProtectedPlace[] = [
    { path: sessions, what: 'the sessions folder', inside: true },
    { path: cwd, what: 'the current folder', inside: false },
  ];
  if (t.configDir)
    places.push({ path: canonicalPath(t.configDir), what: "the config file's folder", inside: false });
  const roots = new Set([cwd, sessions, ...(t.configDir ? [canonicalPath(t.configDir)] : [])].map(gitRootOf));
  for (const root of roots)
    if (root !== null) places.push({ path: root, what: 'a git work tree root', inside: false });
  return places;
}

/** Refuses (throws TargetRefused) before a build could replace or empty what it must not. */
export function checkBuildTargets(t: BuildTargets): void {
  const places = placesFor(t);
  const out = probeTarget('output', t.outDir, t.manifestPaths ?? []);
  const refused = decideTarget('output', out, places, CASE_INSENSITIVE);
  if (refused) throw new TargetRefused(refused);
  if (t.cacheDir === null) return;
  const cache = probeTarget('cache', t.cacheDir);
  const cachePlaces = [...places, { path: out.path, what: 'the output folder', inside: true }];
  const cacheRefused = decideTarget('cache', cache, cachePlaces, CASE_INSENSITIVE);
  if (cacheRefused) throw new TargetRefused(cacheRefused);
}

/**
 * A single file a command writes (import-nist --out): never its own input (by name, link or
 * hard link), never a folder or a link, and an existing file only with --force.
 */
export function checkFileTarget(target: string, inputs: readonly string[], force: boolean): string | null {
  const abs = resolve(target);
  let s: ReturnType<typeof lstatSync> | null = null;
  try {
    s = lstatSync(abs);
  } catch {
    s = null;
  }
  for (const input of inputs) {
    const sameName = canonicalPath(input) === canonicalPath(target);
    let sameFile = false;
    try {
      const a = statSync(input);
      const b = statSync(abs);
      sameFile = a.ino === b.ino && a.dev === b.dev;
    } catch {
      sameFile = false;
    }
    if (sameName || sameFile)
      return `refusing to write ${target}: it is the input file ${input}; name another file for --out`;
  }
  if (s === null) return null;
  if (s.isDirectory()) return `refusing to write ${target}: it is a folder; name a file for --out`;
  if (s.isSymbolicLink()) return `refusing to write ${target}: it is a symbolic link; name the file itself`;
  if (!s.isFile()) return `refusing to write ${target}: it is not a regular file`;
  if (!force)
    return `refusing to write ${target}: it already exists; choose another name, or add --force to replace it`;
  return null;
}
