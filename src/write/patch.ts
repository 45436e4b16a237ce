/**
 * Patching the live site in place, for a rebuild that changed a few files of a large site.
 * Swapping a whole staged site in costs a folder and a hard link for every file the site
 * keeps (a folder per session; on the project's machine about 0.5 ms per folder made and as
 * much again to remove the old tree), so touching one session of 10 000 would cost seconds.
 * A patch costs only what changed:
 *
 * 1. the changed files are already written, whole, in the staging folder;
 * 2. a marker `.NAME.patching-PID` is made beside the site (the next build sees a killed patch
 *    and rebuilds the site in full, see swap.ts);
 * 3. each changed file is renamed over its live path (one atomic rename each: a reader sees the
 *    old file or the new one, never part of one), session files before the index pages that
 *    link to them;
 * 4. files the build no longer makes are removed, then folders left empty;
 * 5. the marker is removed (which also tells a running preview to reload).
 *
 * Only ever used when every file of the live site is one the last build wrote and nobody
 * touched since (the manifest vouches for each): a patch never overwrites or removes anything
 * else. A killed patch leaves a mix of old and new files, all whole; the next build replaces
 * the site by a full swap.
 */
import { closeSync, mkdirSync, openSync, rmdirSync, rmSync, unlinkSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { renameRetrying, syncDir } from './swap.js';

/** The start of a patch marker's name, beside the site (the process id follows). */
export function patchMarkerPrefix(out: string): string {
  return `.${basename(out)}.patching-`;
}

export function patchMarkerName(out: string, pid: number): string {
  return join(dirname(out), `${patchMarkerPrefix(out)}${pid}`);
}

export interface Patch {
  /** The staging folder holding the changed files at their site paths. */
  staging: string;
  /** Site paths written to the staging folder. */
  written: readonly string[];
  /** Site paths of the live site that the build no longer makes. */
  removed: readonly string[];
}

/** Depth of a site path: deeper files (session pages) go in before the index that links them. */
const depth = (path: string) => path.split('/').length;

export function applyPatch(out: string, patch: Patch, durable: boolean): void {
  const marker = patchMarkerName(out, process.pid);
  closeSync(openSync(marker, 'w'));
  if (durable) syncDir(dirname(out));
  const touched = new Set<string>();
  const made = new Set<string>([out]);
  const ensureFolder = (folder: string): void => {
    if (made.has(folder)) return;
    mkdirSync(folder, { recursive: true });
    made.add(folder);
  };
  for (const path of [...patch.written].sort((a, b) => depth(b) - depth(a))) {
    const live = join(out, path);
    ensureFolder(dirname(live));
    // Windows refuses to replace a file something has open (a preview serving it): retried.
    renameRetrying(join(patch.staging, path), live);
    touched.add(dirname(live));
  }
  const emptied = new Set<string>();
  for (const path of patch.removed) {
    unlinkSync(join(out, path));
    emptied.add(dirname(join(out, path)));
  }
  // Folders the removals emptied go too, deepest first (a non-empty one stays).
  for (const folder of [...emptied].sort((a, b) => b.length - a.length)) {
    for (let f = folder; f.length > out.length; f = dirname(f)) {
      try {
        rmdirSync(f);
        touched.add(dirname(f));
      } catch {
        break;
      }
    }
  }
  if (durable) for (const folder of touched) syncDir(folder);
  rmSync(patch.staging, { recursive: true, force: true });
  rmSync(marker, { force: true });
}
