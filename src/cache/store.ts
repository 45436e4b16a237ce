/**
 * The build cache on disk: one JSON file per session unit (named by its key) and one SVG file
 * per rendered chart (named by its spec hash). Entries are written to a temporary name and
 * renamed, so a killed build leaves whole entries or none; an unreadable entry is a miss.
 * A `fingerprint` file names the program that wrote the cache; another program starts afresh.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import type { SessionUnit } from '../parallel/unit.js';
import { MARKDOWN_KEY_PREFIX } from '../report/markdown.js';
import type { SessionPart, SiteFile } from '../report/site.js';
import { contentHash, siteFileData } from '../write/manifest.js';
import { writeAtomically } from './atomicWrite.js';
import { INDEX_PAGES_FILE } from './indexPages.js';
import { PROFILE_REFS_FILE } from './profileRefs.js';
import { STAMP_FILE } from './upToDate.js';

export interface FileRef {
  path: string;
  sha256: string;
}

/** A cached session unit with its files as paths and hashes only. */
export type UnitHead = Omit<SessionUnit, 'part'> & {
  part: Omit<SessionPart, 'files'> & { files: FileRef[] };
};

export const CACHE_DIR_NAME = '.lineledger-cache';

/** `.lineledger-cache/<site folder name>/` beside the output folder, never inside the site. */
export function defaultCacheDir(outDir: string): string {
  const out = resolve(outDir);
  return join(dirname(out), CACHE_DIR_NAME, basename(out));
}

function readOrUndefined(path: string): string | undefined {
  try {
    return readFileSync(path, 'utf8');
  } catch {
    return undefined;
  }
}

export function chartDirOf(cacheDir: string): string {
  return join(cacheDir, 'charts');
}

/** A fragment's file: a chart's SVG, or rendered Markdown (report/markdown.ts, `md-` keys). */
function fragmentFile(key: string): string {
  return key.startsWith(MARKDOWN_KEY_PREFIX) ? `${key}.html` : `${key}.svg`;
}

/** Charts held in memory at most (the most recently used): about 10 MB of SVG. */
export const CHARTS_HELD = 400;

/**
 * A chart cache (the Map renderChart takes) backed by the chart folder: looked-up charts are
 * read lazily, new ones written through. Safe to share between workers (whole-file renames).
 * Only the most recently used `held` charts stay in memory: nearly every chart of an archive
 * is drawn once (its data is its session's), so holding them all grew with the archive.
 */
export class ChartStore extends Map<string, string> {
  constructor(
    private readonly dir: string | null,
    private readonly held: number = CHARTS_HELD,
  ) {
    super();
  }
  private hold(hash: string, svg: string): void {
    super.delete(hash);
    super.set(hash, svg);
    // A Map iterates in insertion order: the first key is the least recently used.
    while (this.size > this.held) {
      const oldest = this.keys().next().value as string;
      super.delete(oldest);
    }
  }
  override get(hash: string): string | undefined {
    const held = super.get(hash);
    if (held !== undefined) {
      this.hold(hash, held);
      return held;
    }
    if (this.dir === null) return undefined;
    const svg = readOrUndefined(join(this.dir, fragmentFile(hash)));
    if (svg !== undefined) this.hold(hash, svg);
    return svg;
  }
  override set(hash: string, svg: string): this {
    this.hold(hash, svg);
    if (this.dir !== null) {
      try {
        writeAtomically(join(this.dir, fragmentFile(hash)), svg);
      } catch {
        // A cache that cannot be written only costs time on the next build.
      }
    }
    return this;
  }
}

export class SessionStore {
  private readonly sessionsDir: string;
  readonly chartDir: string;

  /** Opens (or creates) the cache folder; a cache written by another program is emptied. */
  constructor(
    readonly dir: string,
    fingerprint: string,
  ) {
    this.sessionsDir = join(dir, 'sessions');
    this.chartDir = chartDirOf(dir);
    const stamp = join(dir, 'fingerprint');
    const found = readOrUndefined(stamp);
    // Never empty a folder that is not a cache (a mistyped --cache-dir could name the sessions).
    if (found === undefined && existsSync(dir) && readdirSync(dir).length > 0)
      throw new Error(
        `${dir} is not a lineledger cache (it has no fingerprint file): name a new or empty folder`,
      );
    if (found !== fingerprint) {
      // Only what this cache itself made: --cache-dir may name a folder holding other things.
      for (const own of [
        this.sessionsDir,
        this.chartDir,
        join(dir, 'site-manifest.json'),
        join(dir, STAMP_FILE),
        join(dir, PROFILE_REFS_FILE),
        join(dir, INDEX_PAGES_FILE),
        stamp,
      ])
        rmSync(own, { recursive: true, force: true });
      mkdirSync(this.sessionsDir, { recursive: true });
      mkdirSync(this.chartDir, { recursive: true });
      writeAtomically(stamp, fingerprint);
    } else {
      mkdirSync(this.sessionsDir, { recursive: true });
      mkdirSync(this.chartDir, { recursive: true });
    }
  }

  /**
   * A cached session without its files' contents (row, problems, file paths and hashes): a
   * build that can keep the files already in the site never reads them.
   */
  get(key: string): UnitHead | undefined {
    const text = readOrUndefined(join(this.sessionsDir, `${key}.json`));
    if (text === undefined || !existsSync(join(this.sessionsDir, `${key}.files.json`))) return undefined;
    try {
      const head = JSON.parse(text) as UnitHead;
      return head && typeof head.fileName === 'string' && Array.isArray(head.part?.files) ? head : undefined;
    } catch {
      return undefined;
    }
  }

  /** The files of a cached session (read only when the site needs them written). */
  files(key: string): SiteFile[] {
    const text = readOrUndefined(join(this.sessionsDir, `${key}.files.json`));
    try {
      return JSON.parse(text ?? '') as SiteFile[];
    } catch {
      throw new Error(`the cache entry ${key} is damaged: build once with --no-cache`);
    }
  }

  put(key: string, unit: SessionUnit): void {
    const head: UnitHead = {
      ...unit,
      part: {
        ...unit.part,
        files: unit.part.files.map((f) => ({ path: f.path, sha256: contentHash(siteFileData(f)) })),
      },
    };
    try {
      // Files first: a head is only ever found with its files beside it.
      writeAtomically(join(this.sessionsDir, `${key}.files.json`), JSON.stringify(unit.part.files));
      writeAtomically(join(this.sessionsDir, `${key}.json`), JSON.stringify(head));
    } catch {
      // See ChartStore.set.
    }
  }

  /** Drop what this build did not use, so the cache stays the size of the archive. */
  prune(keys: ReadonlySet<string>, charts: ReadonlySet<string>): void {
    const sweep = (dir: string, keep: (stem: string) => boolean) => {
      for (const name of readdirSync(dir)) {
        const stem = name.replace(/(\.files)?\.(json|svg|html)$/, '');
        if (name.endsWith('.tmp') || !keep(stem)) rmSync(join(dir, name), { force: true });
      }
    };
    sweep(this.sessionsDir, (k) => keys.has(k));
    sweep(this.chartDir, (h) => charts.has(h));
  }
}
