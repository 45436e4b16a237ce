/** `lineledger build [DIR]`: every session of a folder into a static site; `--watch` keeps at it. */
import { existsSync, type FSWatcher, readdirSync, readFileSync, watch } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import type { Command } from 'commander';
import type { BuildReport } from '../build.js';
import { programFingerprint } from '../cache/fingerprint.js';
import { defaultCacheDir } from '../cache/store.js';
import { type FileRead, identitiesOf, type StampedSession, stillUpToDate } from '../cache/upToDate.js';
import {
  CONFIG_FILE_NAME,
  configFromDocument,
  defaultConfig,
  type ProjectConfig,
} from '../config/project.js';
import type { ProjectConfigDocument } from '../config/schema.js';
import { escapeControls } from '../diagnostics.js';
import { listSessionFiles, readSessionInput } from '../input/sessionFiles.js';
import { bundledDataDir } from '../lines/dataDir.js';
import type { Catalog } from '../lines/types.js';
import { createProgress, type Verbosity } from '../progress/reporter.js';
import { PROGRAM_VERSION } from '../version.js';
import { TargetRefused } from '../write/guard.js';
import { hasLeftovers } from '../write/swap.js';
import { CommandFailure, EXIT_CANNOT_RUN, EXIT_OK, EXIT_PROBLEMS, printDiagnostics } from './output.js';

interface BuildFlags {
  out?: string;
  title?: string;
  config?: string;
  quiet?: boolean;
  verbose?: boolean;
  jobs?: string;
  cache?: boolean;
  cacheDir?: string;
  watch?: boolean;
  fsync?: boolean;
  pdf?: boolean;
  paper?: string;
}

function parseJobs(text: string | undefined): number | 'auto' {
  if (text === undefined || text === 'auto') return 'auto';
  if (!/^\d+$/.test(text) || Number(text) < 1 || Number(text) > 64)
    throw new CommandFailure(`--jobs takes a number of threads from 1 to 64, or auto (got "${text}")`);
  return Number(text);
}

/** `--config FILE`, else ./lineledger.yaml when present, else none (the defaults). */
function configFileOf(opts: BuildFlags): string | undefined {
  return opts.config ?? (existsSync(CONFIG_FILE_NAME) ? CONFIG_FILE_NAME : undefined);
}

/** The sessions folder (null: none named) and the output folder, from the arguments and a config. */
function placesOf(config: ProjectConfig, dirArg: string | undefined, opts: BuildFlags) {
  return { dir: dirArg ?? config.sessionsDir, out: opts.out ?? config.outDir ?? 'site' };
}

/**
 * What one build needs to know, re-read from the config each time (watch mode picks up edits).
 * The config and catalog readers (and the schema validator they load) are loaded only here.
 */
async function plan(dirArg: string | undefined, opts: BuildFlags) {
  const common = await import('./common.js');
  const config = common.loadConfig(opts.config);
  const { dir, out } = placesOf(config, dirArg, opts);
  if (!dir)
    throw new CommandFailure(
      'name the folder of sessions (lineledger build DIR), or set sessions: in lineledger.yaml',
    );
  return { config, dir, out, loadCatalogFor: common.loadCatalogFor };
}

/**
 * The config as the last build would have read it, without the schema check: only used to
 * find the up-to-date stamp, which vouches for it only if the file is unchanged since a build
 * that validated it. null when it does not even parse (the build reports why).
 */
async function unvalidatedConfig(file: string | undefined): Promise<ProjectConfig | null> {
  if (file === undefined) return defaultConfig();
  try {
    // The YAML library only when there is a config to read: a rebuild of an archive without
    // one that finds nothing changed never loads it.
    const { parseYamlSource } = await import('../session/yamlSource.js');
    const parsed = parseYamlSource(readFileSync(file, 'utf8'), file);
    return parsed.source
      ? configFromDocument(parsed.source.data as ProjectConfigDocument, resolve(file))
      : null;
  } catch {
    return null;
  }
}

/** Everything asked of a build that is not a file it reads (those are compared one by one). */
function stampKey(configFile: string | undefined, dir: string, out: string, opts: BuildFlags): string {
  return JSON.stringify({
    program: programFingerprint(),
    version: PROGRAM_VERSION,
    config: configFile === undefined ? null : resolve(configFile),
    dir: resolve(dir),
    out: resolve(out),
    title: opts.title ?? null,
    epoch: process.env.SOURCE_DATE_EPOCH ?? null,
  });
}

function cacheDirOf(out: string, opts: BuildFlags): string | null {
  return opts.cache === false ? null : opts.cacheDir ? resolve(opts.cacheDir) : defaultCacheDir(out);
}

/** The last build's sessions when nothing it read or was asked has changed since; else null. */
async function lastBuildIfUnchanged(dirArg: string | undefined, opts: BuildFlags) {
  // With --pdf the records are printed afresh, so the build runs in full.
  if (opts.pdf) return null;
  const configFile = configFileOf(opts);
  const config = await unvalidatedConfig(configFile);
  if (config === null) return null;
  const { dir, out } = placesOf(config, dirArg, opts);
  const cacheDir = cacheDirOf(out, opts);
  if (dir === null || cacheDir === null) return null;
  // A killed build's staging folder is cleaned up by the next full build.
  if (hasLeftovers(resolve(out))) return null;
  try {
    const sessions = stillUpToDate(
      cacheDir,
      resolve(out),
      stampKey(configFile, dir, out, opts),
      listSessionFiles(dir),
    );
    return sessions && { sessions, dir, out };
  } catch {
    return null; // An unlistable folder: the full build reports it.
  }
}

/** The catalog the last build in this process loaded, by the identities of its files. */
let lastCatalog: { key: string; catalog: Catalog } | null = null;

/** The files shipped with the program that a build reads: line lists, priors, groups, templates. */
function bundledFiles(): string[] {
  const data = bundledDataDir();
  const files = (dir: string) => {
    try {
      return readdirSync(dir, { withFileTypes: true })
        .filter((e) => e.isFile())
        .map((e) => join(dir, e.name));
    } catch {
      return [];
    }
  };
  return [...files(data), ...files(join(data, 'lines')), ...files(join(data, '..', 'templates'))];
}

/** What a session's report needs from a build, from the build itself or from the stamp. */
interface Outcome {
  sessions: readonly StampedSession[];
  failed: number;
  /** How it went, for --verbose. */
  detail: string;
  timings: BuildReport['timings'] | null;
}

function printOutcome(o: Outcome, dir: string, out: string, opts: BuildFlags): void {
  for (const s of o.sessions) {
    const shown = !s.ok ? s.diagnostics : opts.quiet ? [] : s.warnings;
    if (shown.length === 0) continue;
    // The same safe read as the build (no huge file, no link out of the folder) for the source lines.
    const input = readSessionInput(s.file, dir);
    printDiagnostics(
      shown,
      input && 'bytes' in input ? Buffer.from(input.bytes).toString('utf8') : undefined,
    );
  }
  const built = o.sessions.length - o.failed;
  if (!opts.quiet || o.failed > 0) {
    process.stderr.write(
      `lineledger: built ${built} of ${o.sessions.length} sessions into ${out}${o.failed ? `; ${o.failed} failed` : ''}${opts.verbose ? ` (${o.detail})` : ''}\n`,
    );
    const t = o.timings;
    if (opts.verbose && t) {
      const ms = (x: number) => `${Math.round(x)} ms`;
      process.stderr.write(
        `lineledger: time: reading and cache lookup ${ms(t.prepare_ms)}, sessions ${ms(t.sessions_ms)}, index ${ms(t.index_ms)}, swap and cache upkeep ${ms(t.finish_ms)}\n`,
      );
    }
  }
}

async function buildOnce(dirArg: string | undefined, opts: BuildFlags): Promise<number> {
  const started = performance.now();
  const known = await lastBuildIfUnchanged(dirArg, opts);
  if (known !== null) {
    const failed = known.sessions.filter((s) => !s.ok).length;
    const ms = Math.round(performance.now() - started);
    const detail = `nothing changed since the last build: the site was left as it was, ${ms} ms`;
    printOutcome({ sessions: known.sessions, failed, detail, timings: null }, known.dir, known.out, opts);
    return failed > 0 ? EXIT_PROBLEMS : EXIT_OK;
  }

  const configFile = configFileOf(opts);
  // Identities before the files are read: an edit during the build shows next time.
  const configRead = identitiesOf(configFile === undefined ? [] : [resolve(configFile)]);
  const { config, dir, out, loadCatalogFor } = await plan(dirArg, opts);
  const read: FileRead[] = [
    ...configRead,
    ...identitiesOf([...config.catalogs.flatMap((c) => [c.lines, c.sources]), ...bundledFiles()]),
  ];
  const key = stampKey(configFile, dir, out, opts);
  const epochText = process.env.SOURCE_DATE_EPOCH;
  const { buildSite, readSourceDateEpoch } = await import('../build.js');
  // A watch rebuild reuses the catalog while none of its files changed (their identities, taken
  // before reading, are in `read`): with a project's own line lists it is parsed in full, which
  // takes 80–100 ms (the bundled catalog alone is read precompiled, lines/precompiled.ts).
  const catalogKey = JSON.stringify([config.catalogs, read.slice(configRead.length)]);
  const catalog = lastCatalog?.key === catalogKey ? lastCatalog.catalog : loadCatalogFor(config);
  lastCatalog = { key: catalogKey, catalog };
  const verbosity: Verbosity = opts.quiet ? 'quiet' : opts.verbose ? 'verbose' : 'normal';
  const progress = createProgress({
    write: (s) => process.stderr.write(s),
    isTTY: process.stderr.isTTY === true,
    verbosity,
  });
  const epoch = readSourceDateEpoch(epochText);
  if (epoch.problem) process.stderr.write(`lineledger: warning: ${escapeControls(epoch.problem)}\n`);
  const report = await buildSite(
    {
      inputDir: dir,
      outDir: out,
      settings: {
        title: opts.title ?? config.title,
        owner: config.owner,
        introMarkdown: config.introMarkdown,
      },
      instrumentDefaults: config.defaultInstrument,
      programVersion: PROGRAM_VERSION,
      sourceDateEpoch: epochText,
      jobs: parseJobs(opts.jobs),
      durable: opts.fsync === true,
      pdf: opts.pdf === true,
      cacheDir: cacheDirOf(out, opts),
      configDir: config.file ? dirname(resolve(config.file)) : null,
      onStart: (n) => progress.start(n),
      onSession: (e) => progress.session(e),
      // A --pdf build links the PDFs from its pages: not the site a plain build would make.
      stamp: opts.pdf ? undefined : { key, read },
    },
    catalog,
  )
    .catch((e: Error) => {
      if (e instanceof TargetRefused) throw new CommandFailure(e.message);
      throw new CommandFailure(`build failed: ${e.message}`);
    })
    .finally(() => progress.finish());
  const detail = `${report.cached} from the cache, ${report.computed} computed${report.jobs > 1 ? ` on ${report.jobs} threads` : ''}, ${Math.round(performance.now() - started)} ms`;
  printOutcome({ ...report, detail }, dir, out, opts);
  if (opts.pdf) {
    const pdfCode = await writePdfs(
      out,
      report.sessions,
      opts.paper === 'letter' ? 'Letter' : 'A4',
      opts.quiet === true,
    );
    if (pdfCode !== EXIT_OK) return pdfCode;
  }
  return report.failed > 0 ? EXIT_PROBLEMS : EXIT_OK;
}

/** `--pdf`: print each built record through the system Chromium, or say how to get one. */
async function writePdfs(
  out: string,
  sessions: readonly { ok: boolean; id: string | null }[],
  paper: 'A4' | 'Letter',
  quiet: boolean,
): Promise<number> {
  const { findChromium, printRecords, PDF_INSTALL_HINT } = await import('../pdf/printRecords.js');
  const browser = findChromium();
  if (!browser) {
    process.stderr.write(`lineledger: no PDF written. ${PDF_INSTALL_HINT}\n`);
    return EXIT_CANNOT_RUN;
  }
  const ids = sessions.filter((s) => s.ok && s.id !== null).map((s) => s.id as string);
  const result = await printRecords(resolve(out), ids, paper, browser);
  for (const p of result.problems) process.stderr.write(`lineledger: PDF of ${p}\n`);
  if (!quiet)
    process.stderr.write(
      `lineledger: wrote ${result.written.length} PDF records (${paper}) with ${browser}\n`,
    );
  return result.problems.length > 0 ? EXIT_PROBLEMS : EXIT_OK;
}

/** Folders to watch, each with the names in it that matter (null: every session file). */
async function watchTargets(
  dirArg: string | undefined,
  opts: BuildFlags,
): Promise<Map<string, Set<string> | null>> {
  const { config, dir } = await plan(dirArg, opts);
  const targets = new Map<string, Set<string> | null>([[resolve(dir), null]]);
  const add = (file: string) => {
    const d = dirname(resolve(file));
    const names = targets.get(d);
    if (names === null) return;
    targets.set(d, new Set([...(names ?? []), basename(file)]));
  };
  add(opts.config ?? config.file ?? 'lineledger.yaml');
  for (const c of config.catalogs) {
    add(c.lines);
    add(c.sources);
  }
  return targets;
}

const DEBOUNCE_MS = 200;

/** Session files, and the kinds of profile file a session may name beside it. */
const WATCHED_SESSION_FILES = /\.(ya?ml|csv|tsv|txt|dat|fits?|fts)$/i;

/**
 * Watches the folders holding the sessions, the config and the own line lists (folders, not
 * files: editors save by replacing a file, which ends a watch on the file itself). Changes are
 * debounced; a change during a build queues one more build, which the cache keeps incremental.
 */
async function watchAndBuild(dirArg: string | undefined, opts: BuildFlags): Promise<number> {
  let code = EXIT_OK;
  let watchers: FSWatcher[] = [];
  let timer: NodeJS.Timeout | undefined;
  let running = false;
  let again = false;
  let watched = '';

  const once = async () => {
    try {
      code = await buildOnce(dirArg, opts);
    } catch (e) {
      if (!(e instanceof CommandFailure)) throw e;
      process.stderr.write(`lineledger: ${e.message}\n`);
      code = e.exitCode;
    }
  };
  const rewatch = async () => {
    let targets: Map<string, Set<string> | null>;
    try {
      targets = await watchTargets(dirArg, opts);
    } catch {
      return; // A broken config was reported by the build; keep the folders watched so far.
    }
    const signature = JSON.stringify([...targets].map(([d, n]) => [d, n ? [...n].sort() : null]));
    if (signature === watched) return;
    for (const w of watchers) w.close();
    watched = signature;
    watchers = [...targets].map(([dir, names]) =>
      watch(dir, (_event, name) => {
        const file = name?.toString() ?? null;
        // In the sessions folder: session files, and the profile files sessions name beside them.
        if (file !== null && (names ? !names.has(file) : !WATCHED_SESSION_FILES.test(file))) return;
        schedule();
      }),
    );
  };
  const run = async () => {
    if (running) {
      again = true;
      return;
    }
    running = true;
    do {
      again = false;
      await once();
      await rewatch();
    } while (again);
    running = false;
    if (!opts.quiet) process.stderr.write('lineledger: watching for changes (Ctrl-C to stop)\n');
  };
  const schedule = () => {
    clearTimeout(timer);
    timer = setTimeout(() => void run(), DEBOUNCE_MS);
  };

  await run();
  await new Promise<void>((stop) => {
    const end = () => {
      process.off('SIGINT', end);
      process.off('SIGTERM', end);
      stop();
    };
    process.on('SIGINT', end);
    process.on('SIGTERM', end);
  });
  clearTimeout(timer);
  for (const w of watchers) w.close();
  return code === EXIT_CANNOT_RUN ? EXIT_CANNOT_RUN : code;
}

export function registerBuild(program: Command, done: (code: number) => void): void {
  program
    .command('build')
    .description('build every session of a folder into a static site')
    .argument('[dir]', 'folder of session YAML files (default: sessions: in lineledger.yaml)')
    .option('--out <dir>', 'output folder (default: out: in lineledger.yaml, else site)')
    .option('--title <text>', "archive title (default: the config's title)")
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .option('-q, --quiet', 'print only problems')
    .option('-v, --verbose', 'print a line per session with its status and time')
    .option(
      '-j, --jobs <n>',
      'threads of the build, this one included: a number, or auto (serial for small archives and on one core; on two cores a render thread beside this one)',
      'auto',
    )
    .option('--no-cache', 'rebuild every session and keep no cache')
    .option('--cache-dir <dir>', 'cache folder (default: .lineledger-cache/<out name> beside the output)')
    .option('--fsync', 'flush every file to disk before the swap, so the site also survives a power cut')
    .option('-w, --watch', 'rebuild when a session, the config or an own line list changes')
    .option('--pdf', 'also print each record to sessions/<id>/record.pdf through the system Chromium')
    .option('--paper <size>', 'paper for --pdf: a4 or letter', 'a4')
    .action(async (dir: string | undefined, opts: BuildFlags) =>
      done(await (opts.watch ? watchAndBuild(dir, opts) : buildOnce(dir, opts))),
    );
}
