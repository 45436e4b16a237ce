/**
 * The write edge: the site's files go into a fresh staging folder beside the target, and only
 * a finished build is swapped in, so an interrupted or failed build never leaves a half-written
 * site. A rebuild that changed only a few files of a site it wrote patches them in instead
 * (patch.ts): each file is replaced whole, and a patch killed part-way is repaired by the next
 * build. Files can be written as sessions finish (a streaming build keeps little in memory);
 * nothing outside the staging folder changes before `commit`. Paths are checked to stay inside
 * the output folder.
 */
import {
  closeSync,
  copyFileSync,
  existsSync,
  fsyncSync,
  linkSync,
  mkdirSync,
  openSync,
  rmSync,
  writeSync,
} from 'node:fs';
import { dirname, relative, resolve } from 'node:path';
import type { SiteFile } from '../report/site.js';
import { contentHash, listFiles, siteFileData } from './manifest.js';
import { applyPatch } from './patch.js';
import { cleanLeftovers, previousName, recoverInterruptedSwap, stagingName, swapIn } from './swap.js';

export function safeJoin(root: string, path: string): string {
  const target = resolve(root, path);
  const rel = relative(resolve(root), target);
  if (rel === '' || rel.startsWith('..') || resolve(root, rel) !== target) {
    throw new Error(`refusing to write outside the output folder: ${path}`);
  }
  return target;
}

export interface StagingOptions {
  /**
   * Flush each file and folder to stable storage before the swap (default false): after a
   * power cut the swapped-in site then never holds empty files. Without it, a killed build or
   * a failed one still leaves the old site whole; only a power cut in the seconds after a swap
   * could. It costs a few milliseconds per file (seconds for a large archive), hence opt-in.
   */
  durable?: boolean;
  /**
   * Files of the live site known to be unchanged since they were written (path → SHA-256,
   * from the manifest). A staged file with the same path and hash is hard-linked from the live
   * site instead of written; when every file is such a file and nothing else is in the site,
   * `commit` leaves the site as it is.
   */
  reuse?: ReadonlyMap<string, string>;
}

export interface Staging {
  /** The staging folder (for tests and messages). */
  readonly dir: string;
  write(files: readonly SiteFile[]): void;
  /**
   * Files known by path and hash: kept from the live site when all of them can be, else
   * written from `load()` (called at most once).
   */
  writeKnown(files: readonly { path: string; sha256: string }[], load: () => readonly SiteFile[]): void;
  /**
   * Put the staged site in place of the old one: by a swap, or (few files changed, every live
   * file vouched for by the manifest) by a patch in place (patch.ts); false when the site
   * already was it.
   */
  commit(): boolean;
  /** SHA-256 of every file written so far, by path (empty strings unless `reuse` is given). */
  readonly hashes: ReadonlyMap<string, string>;
  /**
   * After `commit`: the site paths left exactly in place, neither written nor linked (all of
   * them when the site was unchanged, the unchanged ones of a patch, none after a swap).
   */
  readonly untouched: ReadonlySet<string>;
  /** Throw the staged files away; the old site stays as it was. */
  abort(): void;
}

function writeDurably(path: string, contents: string | Uint8Array, durable: boolean): void {
  const fd = openSync(path, 'w');
  try {
    if (typeof contents === 'string') writeSync(fd, contents);
    else for (let at = 0; at < contents.length; ) at += writeSync(fd, contents, at, contents.length - at);
    if (durable) fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/**
 * Opens a staging folder for `outDir`. First repairs what an earlier, killed build may have
 * left: a site moved aside but not replaced is put back, and dead builds' folders are removed.
 */
export function openStaging(outDir: string, options: StagingOptions = {}): Staging {
  const out = resolve(outDir);
  const durable = options.durable ?? false;
  mkdirSync(dirname(out), { recursive: true });
  recoverInterruptedSwap(out);
  cleanLeftovers(out);
  const dir = stagingName(out, process.pid);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const made = new Set<string>([dir]);
  const hashes = new Map<string, string>();
  // Hashes are kept (for the next build's manifest) whenever the caller reuses files.
  const hashing = options.reuse !== undefined;
  const reuse = options.reuse ?? new Map<string, string>();
  // Reusable files are linked only at the commit, and only for a swap: an unchanged site is
  // not copied, and a patched one keeps them where they are.
  const pending: string[] = [];
  const written: string[] = [];
  let open = true;
  const abort = () => {
    open = false;
    rmSync(dir, { recursive: true, force: true });
  };
  const target = (path: string) => {
    const t = safeJoin(dir, path);
    const parent = dirname(t);
    if (!made.has(parent)) {
      mkdirSync(parent, { recursive: true });
      made.add(parent);
    }
    return t;
  };
  const linkPending = () => {
    for (const path of pending) {
      const t = target(path);
      try {
        linkSync(safeJoin(out, path), t);
      } catch {
        // No hard links here (some file systems): copy the bytes instead.
        copyFileSync(safeJoin(out, path), t);
      }
    }
    pending.length = 0;
  };
  const guarded = <T>(f: () => T): T => {
    if (!open) throw new Error('the staging folder is already closed');
    try {
      return f();
    } catch (e) {
      abort();
      throw e;
    }
  };
  const writeFiles = (files: readonly SiteFile[]) => {
    for (const f of files) {
      safeJoin(dir, f.path);
      const data = siteFileData(f);
      const sha = hashing ? contentHash(data) : '';
      if (hashes.has(f.path)) throw new Error(`the site has two files at ${f.path}`);
      hashes.set(f.path, sha);
      if (sha !== '' && reuse.get(f.path) === sha) {
        pending.push(f.path);
        continue;
      }
      written.push(f.path);
      writeDurably(target(f.path), data, durable);
    }
  };
  /** How the staged site replaces the live one: not at all, by a patch, or by a swap. */
  const plan = (): { how: 'unchanged' } | { how: 'swap' } | { how: 'patch'; removed: string[] } => {
    if (!existsSync(out)) return { how: 'swap' };
    const live = listFiles(out);
    if (written.length === 0 && live.length === hashes.size && live.every((p) => hashes.has(p)))
      return { how: 'unchanged' };
    // A patch only where the manifest vouches for every live file (nothing else is there to
    // overwrite or remove) and few files changed: beyond a quarter of the site a swap costs
    // little beside the build, and keeps the site whole at every moment.
    if (written.length * 4 <= hashes.size && live.every((p) => reuse.has(p)))
      return { how: 'patch', removed: live.filter((p) => !hashes.has(p)) };
    return { how: 'swap' };
  };
  const untouched = new Set<string>();
  return {
    dir,
    hashes,
    untouched,
    write(files) {
      guarded(() => writeFiles(files));
    },
    writeKnown(files, load) {
      guarded(() => {
        if (!hashing || !files.every((f) => reuse.get(f.path) === f.sha256 && !hashes.has(f.path)))
          return writeFiles(load());
        for (const f of files) {
          safeJoin(dir, f.path);
          hashes.set(f.path, f.sha256);
          pending.push(f.path);
        }
      });
    },
    commit() {
      const how = guarded(() => {
        const p = plan();
        if (p.how === 'swap') linkPending();
        return p;
      });
      open = false;
      if (how.how === 'unchanged') {
        rmSync(dir, { recursive: true, force: true });
        for (const path of hashes.keys()) untouched.add(path);
        return false;
      }
      if (how.how === 'patch') {
        // A patch that fails part-way leaves its marker: the next build swaps in a full site.
        applyPatch(out, { staging: dir, written, removed: how.removed }, durable);
        for (const path of pending) untouched.add(path);
        return true;
      }
      try {
        swapIn(dir, out, previousName(out, process.pid), durable);
      } catch (e) {
        rmSync(dir, { recursive: true, force: true });
        throw e;
      }
      return true;
    },
    abort,
  };
}

export function writeSiteAtomically(
  outDir: string,
  files: readonly SiteFile[],
  options?: StagingOptions,
): void {
  const staging = openStaging(outDir, options);
  staging.write(files);
  staging.commit();
}
