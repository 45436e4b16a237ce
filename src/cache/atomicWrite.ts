/**
 * Writes a file by renaming a finished temporary file over it, so a reader (or a build killed
 * half-way) never sees half a file. The temporary name carries the process, the thread and a
 * random tag: two builds, or two threads of one build, never share it. Its `.tmp` ending is
 * what the cache guard recognises as the cache's own leftover.
 */
import { randomBytes } from 'node:crypto';
import { renameSync, writeFileSync } from 'node:fs';
import { threadId } from 'node:worker_threads';

export function writeAtomically(path: string, contents: string): void {
  const tmp = `${path}.${process.pid}-${threadId}-${randomBytes(4).toString('hex')}.tmp`;
  writeFileSync(tmp, contents);
  renameSync(tmp, path);
}
