/**
 * The write edge: the site's files go into a fresh temporary folder beside the target, and
 * only a finished build is swapped in (rename), so an interrupted or failed build never
 * leaves a half-written site. Paths are checked to stay inside the output folder.
 */
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import type { SiteFile } from '../report/site.js';

export function safeJoin(root: string, path: string): string {
  const target = resolve(root, path);
  const rel = relative(resolve(root), target);
  if (rel === '' || rel.startsWith('..') || resolve(root, rel) !== target) {
    throw new Error(`refusing to write outside the output folder: ${path}`);
  }
  return target;
}

export function writeSiteAtomically(outDir: string, files: readonly SiteFile[]): void {
  const out = resolve(outDir);
  const parent = dirname(out);
  mkdirSync(parent, { recursive: true });
  const staging = join(parent, `.${basename(out)}.building-${process.pid}`);
  rmSync(staging, { recursive: true, force: true });
  mkdirSync(staging, { recursive: true });
  try {
    for (const f of files) {
      const target = safeJoin(staging, f.path);
      mkdirSync(dirname(target), { recursive: true });
      writeFileSync(target, f.contents);
    }
  } catch (e) {
    rmSync(staging, { recursive: true, force: true });
    throw e;
  }
  const previous = join(parent, `.${basename(out)}.previous-${process.pid}`);
  if (existsSync(out)) renameSync(out, previous);
  renameSync(staging, out);
  rmSync(previous, { recursive: true, force: true });
}
