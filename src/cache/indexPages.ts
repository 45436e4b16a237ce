/**
 * The pages of sessions of a large archive, as the last build left them: each page's key (a
 * digest of what it is made of, report/site.ts indexPlan, with the templates) and its file's
 * SHA-256. A page whose key is unchanged and whose file the manifest vouches for is kept as it
 * is instead of rendered again: touching one session of 10 000 changes one page of 100.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { writeAtomically } from './atomicWrite.js';

export const INDEX_PAGES_FILE = 'index-pages.json';

export type IndexPageRecords = Map<string, { key: string; sha256: string }>;

export function readIndexPages(cacheDir: string): IndexPageRecords {
  try {
    const data: unknown = JSON.parse(readFileSync(join(cacheDir, INDEX_PAGES_FILE), 'utf8'));
    const out: IndexPageRecords = new Map();
    if (data === null || typeof data !== 'object' || Array.isArray(data)) return out;
    for (const [path, v] of Object.entries(data as Record<string, unknown>)) {
      const r = v as { key?: unknown; sha256?: unknown };
      if (typeof r?.key === 'string' && typeof r.sha256 === 'string' && /^[0-9a-f]{64}$/.test(r.sha256))
        out.set(path, { key: r.key, sha256: r.sha256 });
    }
    return out;
  } catch {
    return new Map(); // Missing or damaged: every page is rendered.
  }
}

export function writeIndexPages(cacheDir: string, records: IndexPageRecords): void {
  writeAtomically(join(cacheDir, INDEX_PAGES_FILE), JSON.stringify(Object.fromEntries(records)));
}

/** Whether two records hold the same pages (the file is written only when they differ). */
export function samePages(a: IndexPageRecords, b: IndexPageRecords): boolean {
  if (a.size !== b.size) return false;
  for (const [path, r] of a) {
    const o = b.get(path);
    if (!o || o.key !== r.key || o.sha256 !== r.sha256) return false;
  }
  return true;
}

/** A page's key with the templates it is rendered by. */
export function pageKey(templatesKey: string, contentKey: string): string {
  return createHash('sha256').update(templatesKey).update(contentKey).digest('hex');
}
