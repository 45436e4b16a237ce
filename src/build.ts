/**
 * Folder of sessions → site. The orchestration: the read edge (session files, templates), the
 * per-session units (from the cache, or computed serially or in worker threads), the index,
 * and the write edge (a staging folder swapped in at the end). Sessions are written to the
 * staging folder in file order as they finish, so memory stays flat on a large archive.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { programFingerprint } from './cache/fingerprint.js';
import { contextKey, sessionKey } from './cache/key.js';
import { ChartStore, defaultCacheDir, SessionStore, type UnitHead } from './cache/store.js';
import type { Diagnostic } from './diagnostics.js';
import type { Catalog } from './lines/types.js';
import { autoJobs, runPool } from './parallel/pool.js';
import type { TaskMessage } from './parallel/protocol.js';
import { NotingCache, processSession, type SessionUnit } from './parallel/unit.js';
import type { SessionEvent } from './progress/reporter.js';
import {
  failedRow,
  type IndexRow,
  type OverviewEntry,
  type RenderContext,
  renderIndexFiles,
  type SiteSettings,
} from './report/site.js';
import { compileTemplates, type Templates, type TemplateTexts } from './report/templates.js';
import type { InstrumentSpec } from './session/types.js';
import { readManifest, verifiedFiles, writeManifest } from './write/manifest.js';
import { openStaging } from './write/writeSite.js';

export interface BuildOptions {
  inputDir: string;
  outDir: string;
  settings: SiteSettings;
  /** lineledger.yaml's default_instrument, inherited by sessions that give none. */
  instrumentDefaults?: InstrumentSpec | null;
  programVersion: string;
  /** SOURCE_DATE_EPOCH, when the environment sets it. */
  sourceDateEpoch: string | undefined;
  /** Worker threads; 1 builds in this thread; 'auto' (default) decides by archive size. */
  jobs?: number | 'auto';
  /** The cache folder; null builds everything afresh and keeps no cache. */
  cacheDir?: string | null;
  /** fsync every file and folder before the swap (survives a power cut; slower). */
  durable?: boolean;
  /** Told of every session as it is placed in the site. */
  onSession?: (event: SessionEvent) => void;
  /** Told the number of sessions once they are listed. */
  onStart?: (total: number) => void;
  /** The build will print record.pdf files (build --pdf), so pages link them. */
  pdf?: boolean;
}

/** What the command line needs of each session: diagnostics carry the file's full path. */
export interface SessionReport {
  file: string;
  id: string | null;
  ok: boolean;
  status: string;
  diagnostics: Diagnostic[];
  warnings: Diagnostic[];
  /** null when the session came from the cache. */
  ms: number | null;
}

export interface BuildReport {
  sessions: SessionReport[];
  failed: number;
  /** Sessions taken from the cache / computed in this build. */
  cached: number;
  computed: number;
  /** Worker threads used (1: serial; 0: nothing computed). */
  jobs: number;
  /** The site already was the build's output, so it was left as it was (no swap). */
  unchanged: boolean;
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

export function listSessionFiles(dir: string): string[] {
  return readdirSync(dir)
    .filter((n) => /\.ya?ml$/i.test(n) && statSync(join(dir, n)).isFile())
    .sort()
    .map((n) => join(dir, n));
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

export function builtOnFromEpoch(epoch: string | undefined): string | null {
  if (!epoch || !/^\d+$/.test(epoch)) return null;
  return new Date(Number(epoch) * 1000).toISOString().slice(0, 10);
}

export async function buildSite(
  options: BuildOptions,
  catalog: Catalog,
  templateTexts: TemplateTexts = readTemplateTexts(),
): Promise<BuildReport> {
  const paths = listSessionFiles(options.inputDir);
  const inputs = paths.map((p) => ({ path: p, bytes: readFileSync(p) as Uint8Array }));
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

  const cacheDir = options.cacheDir === undefined ? defaultCacheDir(options.outDir) : options.cacheDir;
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
  const keys = inputs.map((i) => sessionKey(context, i.path.replace(/^.*[\\/]/, ''), i.bytes));
  // A session is either computed in this build or known from the cache by its head.
  type Known = { unit: SessionUnit; head?: undefined } | { unit?: undefined; head: UnitHead };
  const units: (Known | undefined)[] = keys.map((k) => {
    const head = store?.get(k);
    return head ? { head } : undefined;
  });
  const fromCache = units.map((u) => u !== undefined);
  const times: (number | null)[] = units.map(() => null);

  const manifestPath = store ? join(store.dir, 'site-manifest.json') : null;
  const reuse = manifestPath ? verifiedFiles(readManifest(manifestPath, options.outDir)) : undefined;
  const staging = openStaging(options.outDir, { durable: options.durable ?? false, reuse });
  const rows: IndexRow[] = [];
  const overview: OverviewEntry[] = [];
  const usedCharts = new Set<string>();
  const sessions: SessionReport[] = [];
  const seenIds = new Map<string, string>();
  let placed = 0;

  // Sessions go into the site in file order: the first file with an id keeps it.
  const place = () => {
    for (let known = units[placed]; known !== undefined; known = units[++placed]) {
      const u = known.unit ?? known.head;
      const path = (inputs[placed] as { path: string }).path;
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
    }
  };

  const computed = (index: number, unit: SessionUnit, ms: number | null) => {
    units[index] = { unit };
    times[index] = ms;
    store?.put(keys[index] as string, unit);
    place();
  };

  const todo: TaskMessage[] = [];
  inputs.forEach((input, index) => {
    if (!fromCache[index]) todo.push({ index, path: input.path, bytes: input.bytes });
  });
  const jobs = options.jobs === undefined || options.jobs === 'auto' ? autoJobs(todo.length) : options.jobs;

  let swapped = false;
  try {
    place();
    if (jobs <= 1) {
      for (const t of todo) {
        const t0 = performance.now();
        const unit = await processSession(t.path, t.bytes, { render: ctx, instrumentDefaults }, charts);
        computed(t.index, unit, performance.now() - t0);
      }
    } else {
      const { templates: _compiled, catalog: _catalog, ...render } = ctx;
      await runPool(
        todo,
        jobs,
        {
          catalog,
          templates: templateTexts,
          render,
          instrumentDefaults,
          chartDir: store ? store.chartDir : null,
        },
        computed,
      );
    }
    const indexCharts = new NotingCache(charts);
    staging.write(await renderIndexFiles(rows, overview, ctx, indexCharts));
    for (const h of indexCharts.asked) usedCharts.add(h);
    swapped = staging.commit();
  } catch (e) {
    staging.abort();
    throw e;
  }
  if (manifestPath) writeManifest(manifestPath, options.outDir, staging.hashes);
  store?.prune(new Set(keys), usedCharts);
  const computedCount = fromCache.filter((c) => !c).length;
  return {
    sessions,
    failed: sessions.filter((s) => !s.ok).length,
    cached: inputs.length - computedCount,
    computed: computedCount,
    jobs: computedCount === 0 ? 0 : jobs,
    unchanged: !swapped,
  };
}
