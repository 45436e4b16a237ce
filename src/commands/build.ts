/** `lineledger build [DIR]`: every session of a folder into a static site; `--watch` keeps at it. */
import { type FSWatcher, watch } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import type { Command } from 'commander';
import { buildSite, readSessionInput, readSourceDateEpoch } from '../build.js';
import { escapeControls } from '../diagnostics.js';
import { createProgress, type Verbosity } from '../progress/reporter.js';
import { PROGRAM_VERSION } from '../version.js';
import { TargetRefused } from '../write/guard.js';
import {
  CommandFailure,
  EXIT_CANNOT_RUN,
  EXIT_OK,
  EXIT_PROBLEMS,
  loadCatalogFor,
  loadConfig,
  printDiagnostics,
} from './common.js';

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

/** What one build needs to know, re-read from the config each time (watch mode picks up edits). */
function plan(dirArg: string | undefined, opts: BuildFlags) {
  const config = loadConfig(opts.config);
  const dir = dirArg ?? config.sessionsDir;
  if (!dir)
    throw new CommandFailure(
      'name the folder of sessions (lineledger build DIR), or set sessions: in lineledger.yaml',
    );
  return { config, dir, out: opts.out ?? config.outDir ?? 'site' };
}

async function buildOnce(dirArg: string | undefined, opts: BuildFlags): Promise<number> {
  const { config, dir, out } = plan(dirArg, opts);
  const catalog = loadCatalogFor(config);
  const verbosity: Verbosity = opts.quiet ? 'quiet' : opts.verbose ? 'verbose' : 'normal';
  const progress = createProgress({
    write: (s) => process.stderr.write(s),
    isTTY: process.stderr.isTTY === true,
    verbosity,
  });
  const epoch = readSourceDateEpoch(process.env.SOURCE_DATE_EPOCH);
  if (epoch.problem) process.stderr.write(`lineledger: warning: ${escapeControls(epoch.problem)}\n`);
  const started = performance.now();
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
      sourceDateEpoch: process.env.SOURCE_DATE_EPOCH,
      jobs: parseJobs(opts.jobs),
      durable: opts.fsync === true,
      pdf: opts.pdf === true,
      cacheDir: opts.cache === false ? null : opts.cacheDir ? resolve(opts.cacheDir) : undefined,
      configDir: config.file ? dirname(resolve(config.file)) : null,
      onStart: (n) => progress.start(n),
      onSession: (e) => progress.session(e),
    },
    catalog,
  )
    .catch((e: Error) => {
      if (e instanceof TargetRefused) throw new CommandFailure(e.message);
      throw new CommandFailure(`build failed: ${e.message}`);
    })
    .finally(() => progress.finish());
  for (const s of report.sessions) {
    // The same safe read as the build (no huge file, no link out of the folder) for the source lines.
    const input = readSessionInput(s.file, dir);
    const text = input && 'bytes' in input ? Buffer.from(input.bytes).toString('utf8') : undefined;
    if (!s.ok) printDiagnostics(s.diagnostics, text);
    else if (!opts.quiet) printDiagnostics(s.warnings, text);
  }
  const built = report.sessions.length - report.failed;
  if (!opts.quiet || report.failed > 0) {
    const detail = opts.verbose
      ? ` (${report.cached} from the cache, ${report.computed} computed${report.jobs > 1 ? ` on ${report.jobs} threads` : ''}, ${Math.round(performance.now() - started)} ms)`
      : '';
    process.stderr.write(
      `lineledger: built ${built} of ${report.sessions.length} sessions into ${out}${report.failed ? `; ${report.failed} failed` : ''}${detail}\n`,
    );
    if (opts.verbose) {
      const t = report.timings;
      const ms = (x: number) => `${Math.round(x)} ms`;
      process.stderr.write(
        `lineledger: time: reading and cache lookup ${ms(t.prepare_ms)}, sessions ${ms(t.sessions_ms)}, index ${ms(t.index_ms)}, swap and cache upkeep ${ms(t.finish_ms)}\n`,
      );
    }
  }
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
function watchTargets(dirArg: string | undefined, opts: BuildFlags): Map<string, Set<string> | null> {
  const { config, dir } = plan(dirArg, opts);
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
  const rewatch = () => {
    let targets: Map<string, Set<string> | null>;
    try {
      targets = watchTargets(dirArg, opts);
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
      rewatch();
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
      'threads computing sessions, this one included: a number, or auto (serial for small archives and on one or two cores, where a second thread costs more than it saves)',
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
