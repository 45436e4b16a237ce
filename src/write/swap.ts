/**
 * Swapping a staged site in, and repairing what a killed build left behind. Node has no
 * atomic exchange of two folders, so the swap is two renames in the same parent folder (each
 * atomic): old site → `.NAME.previous-PID`, staging → NAME. A build killed between the two
 * leaves no NAME but a `.previous-` folder, which the next build renames back before it starts.
 * Folders carry the builder's process id so a running build's folders are never touched.
 * A killed patch (patch.ts) leaves a `.NAME.patching-PID` marker: the next build removes it
 * and, since the site then holds files the manifest does not vouch for, swaps in a full site.
 */
import {
  closeSync,
  existsSync,
  fsyncSync,
  openSync,
  readdirSync,
  renameSync,
  rmSync,
  statSync,
} from 'node:fs';
import { basename, dirname, join } from 'node:path';

export function stagingName(out: string, pid: number): string {
  return join(dirname(out), `.${basename(out)}.building-${pid}`);
}

export function previousName(out: string, pid: number): string {
  return join(dirname(out), `.${basename(out)}.previous-${pid}`);
}

function isAlive(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (e) {
    // EPERM: the process exists but belongs to someone else.
    return (e as NodeJS.ErrnoException).code === 'EPERM';
  }
}

interface Leftover {
  path: string;
  kind: 'building' | 'previous' | 'patching';
  pid: number;
}

function leftovers(out: string): Leftover[] {
  const prefix = `.${basename(out)}.`;
  const found: Leftover[] = [];
  for (const name of readdirSync(dirname(out))) {
    if (!name.startsWith(prefix)) continue;
    const m = /^(building|previous|patching)-(\d+)$/.exec(name.slice(prefix.length));
    if (!m) continue;
    const pid = Number(m[2]);
    if (pid !== process.pid && isAlive(pid)) continue;
    found.push({ path: join(dirname(out), name), kind: m[1] as Leftover['kind'], pid });
  }
  return found;
}

/** Whether a killed build left a staging or set-aside folder beside the site (the next build repairs it). */
export function hasLeftovers(out: string): boolean {
  try {
    return leftovers(out).length > 0;
  } catch {
    return false; // No parent folder to list: nothing was left there.
  }
}

/** A build killed mid-swap moved the old site aside: put the newest such folder back. */
export function recoverInterruptedSwap(out: string): void {
  if (existsSync(out)) return;
  const previous = leftovers(out)
    .filter((l) => l.kind === 'previous')
    .sort((a, b) => statSync(b.path).mtimeMs - statSync(a.path).mtimeMs)[0];
  if (previous) renameRetrying(previous.path, out);
}

/** Remove staging and moved-aside folders (and patch markers) of builds no longer running. */
export function cleanLeftovers(out: string): void {
  for (const l of leftovers(out)) rmSync(l.path, { recursive: true, force: true });
}

/** Windows refuses to rename a folder while something (an indexer, a preview) has it open. */
export function renameRetrying(from: string, to: string): void {
  for (let attempt = 0; ; attempt++) {
    try {
      renameSync(from, to);
      return;
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (attempt >= 5 || (code !== 'EPERM' && code !== 'EBUSY' && code !== 'EACCES')) throw e;
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 50 * (attempt + 1));
    }
  }
}

/** fsync a folder so the renames inside it survive a power cut; not possible everywhere. */
export function syncDir(dir: string): void {
  try {
    const fd = openSync(dir, 'r');
    try {
      fsyncSync(fd);
    } finally {
      closeSync(fd);
    }
  } catch {
    // Windows cannot open a folder for fsync; its renames are already journalled.
  }
}

function syncTree(dir: string): void {
  for (const e of readdirSync(dir, { withFileTypes: true })) if (e.isDirectory()) syncTree(join(dir, e.name));
  syncDir(dir);
}

export function swapIn(staging: string, out: string, previous: string, durable: boolean): void {
  if (durable) syncTree(staging);
  const hadSite = existsSync(out);
  if (hadSite) renameRetrying(out, previous);
  try {
    renameRetrying(staging, out);
  } catch (e) {
    if (hadSite) renameRetrying(previous, out);
    throw e;
  }
  if (durable) syncDir(dirname(out));
  rmSync(previous, { recursive: true, force: true });
}
