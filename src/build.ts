/**
 * Folder of sessions → site. The orchestration: the read edge (session files, templates), the
 * per-session units (from the cache, or computed serially or in worker threads), the index,
 * and the write edge (a staging folder swapped in at the end). Sessions are written to the
 * staging folder in file order as they finish, so memory stays flat on a large archive.
 */
import { readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { programFingerprint } from './cache/fingerprint.js';
import {
  type IndexPageRecords,
  pageKey,
  readIndexPages,
  samePages,
  writeIndexPages,
} from './cache/indexPages.js';
import { contextKey, sessionKey } from './cache/key.js';
import { ProfileRefMemo } from './cache/profileRefs.js';
import { ChartStore, defaultCacheDir, SessionStore, type UnitHead } from './cache/store.js';
import { type FileRead, removeStamp, type StampedSession, writeStamp } from './cache/upToDate.js';
import { type Diagnostic, escapeControls } from './diagnostics.js';
import { listSessionFiles, readProfileInput, readSessionInput } from './input/sessionFiles.js';
import type { Catalog } from './lines/types.js';
import { autoJobs, runPool } from './parallel/pool.js';
import type { TaskMessage } from './parallel/protocol.js';
import type { SessionUnit } from './parallel/unit.js';
import type { SessionEvent } from './progress/reporter.js';
import { markdownHtml, markdownKey } from './report/markdown.js';
import {
  failedRow,
  type IndexRow,
  indexPlan,
  type OverviewEntry,
  type PlannedFile,
  type RenderContext,
  type SiteSettings,
} from './report/site.js';
import { compileTemplates, type Templates, type TemplateTexts, templatesKey } from './report/templates.js';
import { profileFileOf } from './session/profile/ref.js';
import type { InstrumentSpec } from './session/types.js';
import { checkBuildTargets } from './write/guard.js';
import { contentHash, hashesOf, readManifest, verifiedEntries, writeManifest } from './write/manifest.js';
import { openStaging, type Staging } from './write/writeSite.js';

export interface BuildOptions {
  inputDir: string;
  outDir: string;
  settings: SiteSettings;
  /** lineledger.yaml's default_instrument, inherited by sessions that give none. */
  instrumentDefaults?: InstrumentSpec | null;
  programVersion: string;
  /** SOURCE_DATE_EPOCH, when the environment sets it. */
  sourceDateEpoch: string | undefined;
  /**
   * Threads computing sessions, this one included (N − 1 workers); 1 builds in this thread alone;
   * 'auto' (default) decides by archive size and cores.
   */
  jobs?: number | 'auto';
  /** The cache folder; null builds everything afresh and keeps no cache. */
  cacheDir?: string | null;
  /** The folder of lineledger.yaml, when one is used: never replaced by the site. */
  configDir?: string | null;
  /** fsync every file and folder before the swap (survives a power cut; slower). */
  durable?: boolean;
  /** Told of every session as it is placed in the site. */
  onSession?: (event: SessionEvent) => void;
  /** Told the number of sessions once they are listed. */
  onStart?: (total: number) => void;
  /** The build will print record.pdf files (build --pdf), so pages link them. */
  pdf?: boolean;
  /** Sessions on a page of the index (default SESSIONS_PER_PAGE; tests page small archives). */
  indexPageSize?: number;
  /**
   * What the command line was asked (its key) and the files it read before the build (config,
   * line lists, bundled data): with a cache, a build that succeeds writes the up-to-date stamp
   * from them, which lets the next `build` skip everything when nothing changed.
   */
  stamp?: { key: string; read: FileRead[] };
}

/**
 * What the command line needs of each session: diagnostics carry the file's full path. The
 * up-to-date stamp keeps the same, without the time.
 */
export interface SessionReport extends StampedSession {
  /** null when the session came from the cache. */
  ms: number | null;
}

export interface BuildReport {
  sessions: SessionReport[];
  failed: number;
  /** Sessions taken from the cache / computed in this build. */
  cached: number;
  computed: number;
  /** Threads that computed sessions, this one included (1: serial; 0: nothing computed). */
  jobs: number;
  /** The site already was the build's output, so it was left as it was (no swap). */
  unchanged: boolean;
  /** Archive-wide files rendered (the rest were kept: a large archive's unchanged pages). */
  indexPagesRendered: number;
  /** Where the build's time went (ms): what `--verbose` prints and the bench reads. */
  timings: BuildTimings;
}

export interface BuildTimings {
  /** Listing and reading the sessions, keys, the cache lookup, opening the staging folder. */
  prepare_ms: number;
  /** Computing the sessions that were not in the cache (and placing all of them). */
  sessions_ms: number;
  /** Rendering and writing the index. */
  index_ms: number;
  /** The swap, the manifest and pruning the cache. */
  finish_ms: number;
}

export function templatesDir(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', 'templates');
}

export function readTemplateTexts(dir: string = templatesDir()): TemplateTexts {
  const read = (name: string) => readFileSync(join(dir, name), 'utf8');
  return {
    layout: read('layout.hbs'),
    index: read('index.hbs'),
    session: read('session.hbs'),
    css: read('style.css'),
  };
}

export function loadTemplates(dir: string = templatesDir()): Templates {
  return compileTemplates(readTemplateTexts(dir));
}

/** The unit of a file that could not be read: it fails with its one problem, the rest build. */
function unreadableUnit(path: string, problem: Diagnostic): SessionUnit {
  const fileName = escapeControls(path.replace(/^.*[\\/]/, ''));
  const diagnostics = [{ ...problem, file: fileName }];
  return {
    fileName,
    ok: false,
    id: null,
    headline: null,
    diagnostics,
    warnings: [],
    part: { files: [], row: failedRow(fileName, null, diagnostics), overview: [] },
    charts: [],
  };
}

function duplicateId(file: string, id: string, first: string): Diagnostic {
  return {
    file,
    line: 1,
    col: 1,
    severity: 'error',
    code: 'duplicate-id',
    field: 'id',
    message: `session id "${id}" is already used by ${first}`,
    hint: 'give this session its own id: (lower-case letters, digits and dashes)',
  };
}

const NO_BYTES = new Uint8Array(0);

/** 10000-01-01T00:00:00Z in seconds: a build date has four digits of year. */
const EPOCH_LIMIT_S = 253_402_300_800;

/**
 * SOURCE_DATE_EPOCH (seconds since 1970, digits only, as `date +%s` prints it) → the build
 * date, or why it was ignored. Never throws: a bad value only loses the date.
 */
export function readSourceDateEpoch(epoch: string | undefined): {
  builtOn: string | null;
  problem: string | null;
} {
  if (epoch === undefined || epoch === '') return { builtOn: null, problem: null };
  const shown = JSON.stringify(epoch.length > 40 ? `${epoch.slice(0, 40)}…` : epoch);
  if (!/^\d+$/.test(epoch))
    return {
      builtOn: null,
      problem: `SOURCE_DATE_EPOCH=${shown} is not a whole number of seconds since 1970 (digits only); ignored, so the pages carry no build date`,
    };
  const seconds = Number(epoch);
  if (!(seconds < EPOCH_LIMIT_S))
    return {
      builtOn: null,
      problem: `SOURCE_DATE_EPOCH=${shown} is after the year 9999; ignored, so the pages carry no build date`,
    };
  return { builtOn: new Date(seconds * 1000).toISOString().slice(0, 10), problem: null };
}

export function builtOnFromEpoch(epoch: string | undefined): string | null {
  return readSourceDateEpoch(epoch).builtOn;
}

/**
 * Writes the archive-wide files one at a time. With a cache, a page whose key (its content's
 * digest and the templates) is the last build's and whose file the manifest vouches for is
 * kept as it is (staging.writeKnown renders it only if the live file cannot be kept). Returns
 * how many files were rendered; `records` receives each keyed page's key and file hash.
 */
function writeIndex(
  plan: Iterable<PlannedFile>,
  staging: Staging,
  cache: { templates: string; before: IndexPageRecords } | null,
  records: IndexPageRecords,
): number {
  let rendered = 0;
  const render = (file: PlannedFile) => {
    rendered++;
    return file.render();
  };
  for (const file of plan) {
    const key = cache && file.key !== null ? pageKey(cache.templates, file.key) : null;
    const before = key === null ? undefined : cache?.before.get(file.path);
    if (key !== null && before?.key === key) {
      staging.writeKnown([{ path: file.path, sha256: before.sha256 }], () => [render(file)]);
      records.set(file.path, before);
      continue;
    }
    const made = render(file);
    staging.write([made]);
    if (key !== null) records.set(file.path, { key, sha256: contentHash(made.contents) });
  }
  return rendered;
}

export async function buildSite(
  options: BuildOptions,
  catalog: Catalog,
  templateTexts: TemplateTexts = readTemplateTexts(),
): Promise<BuildReport> {
  const t0 = performance.now();
  const cacheDir = options.cacheDir === undefined ? defaultCacheDir(options.outDir) : options.cacheDir;
  // Before anything is read or written: the site and cache folders must be ours to replace.
  checkBuildTargets({
    inputDir: options.inputDir,
    outDir: options.outDir,
    cacheDir,
    configDir: options.configDir ?? null,
    manifestPaths: [...new Set([cacheDir, defaultCacheDir(options.outDir)].filter((d) => d !== null))].map(
      (d) => join(d, 'site-manifest.json'),
    ),
  });
  // From here on the site may change: the stamp of the last build no longer vouches for it.
  if (cacheDir !== null) removeStamp(cacheDir);
  const listing = listSessionFiles(options.inputDir);
  const inputs = listing.map((p) => readSessionInput(p, options.inputDir)).filter((i) => i !== null);
  // Every file read, with its identity when opened. A file that could not be read leaves no
  // identity to compare (a broken link mended, a missing profile created): no stamp then.
  const read: FileRead[] = [];
  let stampable = true;
  for (const i of inputs)
    if ('bytes' in i) read.push({ path: i.path, identity: i.identity });
    else stampable = false;
  options.onStart?.(inputs.length);
  const templates = compileTemplates(templateTexts);
  const builtOn = builtOnFromEpoch(options.sourceDateEpoch);
  const buildOptions = options.pdf ? 'lineledger build --pdf' : 'lineledger build (default options)';
  const instrumentDefaults = options.instrumentDefaults ?? null;
  const ctx: RenderContext = {
    catalog,
    templates,
    settings: options.settings,
    programVersion: options.programVersion,
    buildOptions,
    builtOn,
    pdfLinks: options.pdf === true,
  };

  const fingerprint = programFingerprint();
  const store = cacheDir === null ? null : new SessionStore(cacheDir, fingerprint);
  const charts = new ChartStore(store ? store.chartDir : null);
  const context = contextKey({
    fingerprint,
    programVersion: options.programVersion,
    catalog,
    templates: templateTexts,
    settings: options.settings,
    buildOptions,
    builtOn,
    instrumentDefaults,
  });
  // Unreadable files have no key: they are never cached.
  const refs = store ? new ProfileRefMemo(store.dir, profileFileOf) : null;
  const refOf = refs ? (bytes: Uint8Array) => refs.refOf(bytes) : profileFileOf;
  const profiles = inputs.map((i) => ('bytes' in i ? readProfileInput(i.path, i.bytes, refOf, read) : null));
  if (profiles.some((p) => p !== null && 'problem' in p)) stampable = false;
  const keys = inputs.map((i, n) =>
    'bytes' in i ? sessionKey(context, i.path.replace(/^.*[\\/]/, ''), i.bytes, profiles[n] ?? null) : '',
  );
  // A session is either computed in this build or known from the cache by its head.
  type Known = { unit: SessionUnit; head?: undefined } | { unit?: undefined; head: UnitHead };
  // undefined: not known yet; null: placed in the site and let go, so memory does not grow
  // with the archive (what the index needs is in `rows` and `overview`).
  const units: (Known | undefined | null)[] = inputs.map((input, i) => {
    if ('problem' in input) return { unit: unreadableUnit(input.path, input.problem) };
    const head = store?.get(keys[i] as string);
    return head ? { head } : undefined;
  });
  const fromCache = units.map((u) => u?.head !== undefined);
  const times: (number | null)[] = units.map(() => null);

  const manifestPath = store ? join(store.dir, 'site-manifest.json') : null;
  const verified = manifestPath ? verifiedEntries(readManifest(manifestPath, options.outDir)) : null;
  const reuse = verified ? hashesOf(verified) : undefined;
  const staging = openStaging(options.outDir, { durable: options.durable ?? false, reuse });
  const rows: IndexRow[] = [];
  const overview: OverviewEntry[] = [];
  const usedCharts = new Set<string>();
  const sessions: SessionReport[] = [];
  const seenIds = new Map<string, string>();
  let placed = 0;

  // Sessions go into the site in file order: the first file with an id keeps it.
  const place = () => {
    for (let known = units[placed]; known !== undefined && known !== null; known = units[++placed]) {
      const u = known.unit ?? known.head;
      const path = paths[placed] as string;
      const full = (d: Diagnostic): Diagnostic => ({ ...d, file: path });
      let { ok, diagnostics, warnings } = u;
      let row = u.part.row;
      const first = u.ok && u.id !== null ? seenIds.get(u.id) : undefined;
      if (first !== undefined && u.id !== null) {
        const dup = duplicateId(u.fileName, u.id, first);
        ok = false;
        diagnostics = [dup];
        warnings = [];
        row = failedRow(u.fileName, u.headline, diagnostics);
      } else {
        if (u.ok && u.id !== null) seenIds.set(u.id, u.fileName);
        if (known.unit) staging.write(known.unit.part.files);
        else {
          const key = keys[placed] as string;
          staging.writeKnown(known.head.part.files, () => (store as SessionStore).files(key));
        }
        overview.push(...u.part.overview);
        for (const h of u.charts) usedCharts.add(h);
      }
      rows.push(row);
      const report: SessionReport = {
        file: path,
        id: u.id,
        ok,
        status: row.status,
        diagnostics: diagnostics.map(full),
        warnings: warnings.map(full),
        ms: times[placed] ?? null,
      };
      sessions.push(report);
      options.onSession?.({ file: path, status: report.status, ms: report.ms });
      units[placed] = null;
    }
  };

  const computed = (index: number, unit: SessionUnit, ms: number | null) => {
    units[index] = { unit };
    times[index] = ms;
    store?.put(keys[index] as string, unit);
    // The session's bytes are not needed any more (a worker had its own copy).
    const task = taskOf[index];
    if (task) {
      task.bytes = NO_BYTES;
      task.profile = null;
    }
    place();
  };

  const todo: TaskMessage[] = [];
  const taskOf: (TaskMessage | undefined)[] = [];
  inputs.forEach((input, index) => {
    if (units[index] === undefined && 'bytes' in input) {
      const task = { index, path: input.path, bytes: input.bytes, profile: profiles[index] ?? null };
      todo.push(task);
      taskOf[index] = task;
    }
  });
  // From here on only the tasks hold session bytes, and each lets go of them once computed.
  const paths = inputs.map((i) => i.path);
  inputs.length = 0;
  profiles.length = 0;
  const jobs = options.jobs === undefined || options.jobs === 'auto' ? autoJobs(todo.length) : options.jobs;

  let swapped = false;
  let indexPagesRendered = 0;
  const pageRecords: IndexPageRecords = new Map();
  const pagesBefore = store ? readIndexPages(store.dir) : null;
  const t1 = performance.now();
  let t2 = t1;
  let t3 = t1;
  try {
    place();
    // The pipeline is loaded only when some session must be computed: a rebuild with every
    // session in the cache never needs it.
    const { processSession } =
      todo.length > 0 ? await import('./parallel/unit.js') : { processSession: null };
    const here = async (t: TaskMessage) => {
      if (processSession === null) throw new Error('no session to compute');
      const t0 = performance.now();
      const unit = await processSession(
        t.path,
        t.bytes,
        { render: ctx, instrumentDefaults },
        charts,
        t.profile,
      );
      return { unit, ms: performance.now() - t0 };
    };
    if (jobs <= 1) {
      for (const t of todo) {
        const { unit, ms } = await here(t);
        computed(t.index, unit, ms);
      }
    } else {
      const { templates: _compiled, catalog: _catalog, ...render } = ctx;
      const init = {
        catalog,
        templates: templateTexts,
        render,
        instrumentDefaults,
        chartDir: store ? store.chartDir : null,
      };
      if (jobs === 2) {
        const { runWithRenderThread } = await import('./parallel/overlap.js');
        await runWithRenderThread(todo, { render: ctx, instrumentDefaults }, init, computed);
      } else await runPool(todo, jobs, init, computed, here);
    }
    t2 = performance.now();
    // One page at a time: a large archive's index is many pages, none held longer than needed.
    const introHtml = await markdownHtml(ctx.settings.introMarkdown, charts);
    if (ctx.settings.introMarkdown.trim() !== '') usedCharts.add(markdownKey(ctx.settings.introMarkdown));
    indexPagesRendered = writeIndex(
      indexPlan(rows, overview, ctx, introHtml, options.indexPageSize),
      staging,
      pagesBefore && { templates: templatesKey(templateTexts), before: pagesBefore },
      pageRecords,
    );
    t3 = performance.now();
    swapped = staging.commit();
  } catch (e) {
    staging.abort();
    throw e;
  }
  if (manifestPath && verified) {
    const untouched = new Map([...verified].filter(([path]) => staging.untouched.has(path)));
    writeManifest(manifestPath, options.outDir, staging.hashes, untouched);
  }
  store?.prune(new Set(keys), usedCharts);
  if (store && pagesBefore && !samePages(pagesBefore, pageRecords)) writeIndexPages(store.dir, pageRecords);
  refs?.save();
  if (store && options.stamp && stampable)
    writeStamp(store.dir, options.outDir, {
      key: options.stamp.key,
      listing,
      read: [...options.stamp.read, ...read],
      sessions: sessions.map(({ ms: _ms, ...s }) => s),
    });
  const computedCount = fromCache.filter((c) => !c).length;
  return {
    sessions,
    failed: sessions.filter((s) => !s.ok).length,
    cached: paths.length - computedCount,
    computed: computedCount,
    jobs: computedCount === 0 ? 0 : jobs,
    unchanged: !swapped,
    indexPagesRendered,
    timings: {
      prepare_ms: t1 - t0,
      sessions_ms: t2 - t1,
      index_ms: t3 - t2,
      finish_ms: performance.now() - t3,
    },
  };
}
