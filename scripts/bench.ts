/**
 * Build benchmark (npm run bench [N]): generates an archive of N sessions (default 300, or
 * BENCH_SESSIONS), then times a full build, a no-change rebuild, a rebuild with one session
 * touched (in a fresh process, and while `build --watch` runs), and serial (`--jobs 1`) against
 * parallel (`--jobs auto`) builds without cache,
 * BENCH_REPEAT times each (default 3, medians reported: the machine may be shared), each as
 * `node dist/cli.js build` with process start included. A render-only pass measures the
 * charts (a chart cache that times each miss from lookup to store, which is exactly one
 * renderChart call). Prints the times and the ratios of issue 14's targets; asserts nothing.
 * `npm run bench -- --archive N` (opt-in, slow) instead builds a generated archive of N
 * sessions (10 000 by default) with an empty cache, then rebuilds it unchanged and with one
 * session touched, and prints the full build time, each build's peak memory and the ratios.
 */

import { spawn, spawnSync } from 'node:child_process';
import {
  appendFileSync,
  cpSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  symlinkSync,
} from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { readTemplateTexts } from '../src/build.js';
import { loadCatalogFor, loadConfig } from '../src/commands/common.js';
import { autoJobs } from '../src/parallel/pool.js';
import { processSession } from '../src/parallel/unit.js';
import { compileTemplates } from '../src/report/templates.js';
import { PROGRAM_VERSION } from '../src/version.js';
import { ChartTimer, describeTimes, quantile } from './bench-charts.js';
import { makeArchive } from './make-archive.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
// `--archive N`: only the large-archive run (full build, peak memory, no-change rebuild).
const archiveAt = process.argv.indexOf('--archive');
const large = archiveAt >= 0 ? Number(process.argv[archiveAt + 1] ?? 10_000) : null;
if (large !== null && !(large > 0)) throw new Error('usage: npm run bench -- --archive N');
const count = large ?? Number(process.argv[2] ?? process.env.BENCH_SESSIONS ?? 300);
const repeat = Math.max(1, Number(process.env.BENCH_REPEAT ?? 3));
const work = mkdtempSync(join(tmpdir(), 'll-bench-'));
const files = makeArchive(join(work, 'sessions'), count);
const config = loadConfig(join(root, 'lineledger.yaml'));
const catalog = loadCatalogFor(config);
const base = {
  inputDir: join(work, 'sessions'),
  outDir: join(work, 'site'),
  settings: { title: config.title, owner: config.owner, introMarkdown: config.introMarkdown },
};
// The timed builds run the compiled program, copied into the bench folder: a recompile of
// dist/ by someone else during the bench would change the program's fingerprint and empty
// the cache between two runs.
const tsc = spawnSync(
  process.execPath,
  [join(root, 'node_modules', 'typescript', 'bin', 'tsc'), '-p', join(root, 'tsconfig.build.json')],
  { encoding: 'utf8' },
);
if (tsc.status !== 0) throw new Error(`cannot compile dist/: ${tsc.stdout}${tsc.stderr}`);
// The rest of `npm run build:ts`: what the program parses once at build time.
const pre = spawnSync(process.execPath, [join(root, 'dist', 'precompile.js')], { encoding: 'utf8' });
if (pre.status !== 0) throw new Error(`cannot precompile: ${pre.stdout}${pre.stderr}`);
const app = join(work, 'app');
cpSync(join(root, 'dist'), join(app, 'dist'), { recursive: true });
cpSync(join(root, 'package.json'), join(app, 'package.json'));
for (const shared of ['node_modules', 'data', 'templates', 'schema'])
  symlinkSync(join(root, shared), join(app, shared));
const CLI = join(app, 'dist', 'cli.js');

const pct = (a: number, b: number) => `${((100 * a) / b).toFixed(1)} %`;

/** Time inside each build (its own summary line), beside the wall-clock time of the process. */
const inside: number[] = [];
/** Peak resident set of each build's process (KiB, from its own process.resourceUsage()). */
const peaks: number[] = [];

/** A build's summary line, and the time inside the build it reports. */
const SUMMARY = /built \d+ of \d+ sessions[^\n]*/;
const insideMs = (summary: string) => Number(/, (\d+) ms\)/.exec(summary)?.[1] ?? Number.NaN);

/** Times one build as users run it: the compiled command line, in a fresh process. */
function timed(label: string, extra: string[]): number {
  const args = [CLI, 'build', base.inputDir, '--out', base.outDir, '--config', join(root, 'lineledger.yaml')];
  const rss = ['--import', pathToFileURL(join(root, 'scripts', 'report-rss.mjs')).href];
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [...rss, ...args, '--verbose', ...extra], {
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
  });
  const ms = performance.now() - t0;
  const summary = SUMMARY.exec(r.stderr)?.[0] ?? `exit ${r.status}: ${r.stderr.slice(-300)}`;
  inside.push(insideMs(summary));
  const peak = Number(/bench-maxrss-kib (\d+)/.exec(r.stderr)?.[1] ?? Number.NaN);
  peaks.push(peak);
  process.stdout.write(
    `${label.padEnd(36)} ${(ms / 1000).toFixed(2).padStart(8)} s  peak ${(peak / 1024).toFixed(0)} MiB  ${summary.replace(/^built /, '')}\n`,
  );
  return ms;
}

process.stdout.write(
  `lineledger bench: ${count} sessions, ${availableParallelism()} cores, Node ${process.version}, load ${loadavg()
    .map((l) => l.toFixed(1))
    .join(' ')}, in ${work}\n`,
);
const v0 = performance.now();
spawnSync(process.execPath, [CLI, '--version']);
const startup = performance.now() - v0;
process.stdout.write(
  `${'program start (lineledger --version)'.padEnd(36)} ${(startup / 1000).toFixed(2).padStart(8)} s\n`,
);
const cacheArgs = ['--cache-dir', join(work, 'cache')];
const full = timed('full build (cache empty, auto jobs)', cacheArgs);
const none = timed('no-change rebuild', cacheArgs);
const touchedFile = files[Math.floor(files.length / 2)] as string;
appendFileSync(touchedFile, '# touched by the bench\n');
const one = timed('one session touched', cacheArgs);
if (large !== null) {
  // The large-archive run stops here: serial against parallel and the render-only pass would
  // take as long again each.
  const site = base.outDir;
  const pages = readdirSync(site).filter((n) => /^page-\d+\.html$/.test(n));
  const sizes = pages.map((n) => statSync(join(site, n)).size);
  const kib = (b: number) => `${(b / 1024).toFixed(0)} KiB`;
  const manifest = join(work, 'cache', 'site-manifest.json');
  process.stdout.write(
    [
      '',
      `load after the builds: ${loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')}`,
      `full build:                            ${(full / 1000).toFixed(1)} s  (target ≤ 180 s for 10 000 sessions)`,
      `peak memory of the full build:         ${((peaks[0] as number) / 1024).toFixed(0)} MiB  (target ≤ 1024 MiB)`,
      `peak memory of the no-change rebuild:  ${((peaks[1] as number) / 1024).toFixed(0)} MiB`,
      `one session touched / full build:      ${pct(one, full)}  (peak ${((peaks[2] as number) / 1024).toFixed(0)} MiB)`,
      `no-change rebuild / full build:        ${pct(none, full)}  (target ≤ 3 %; issue 14's archive part: < 5 %)`,
      `index.html ${kib(statSync(join(site, 'index.html')).size)}; ${pages.length} pages of sessions, ` +
        `largest ${kib(Math.max(0, ...sizes))}; manifest ${kib(statSync(manifest).size)}`,
      '',
    ].join('\n'),
  );
  rmSync(work, { recursive: true, force: true });
  process.exit(0);
}

/**
 * One session touched while `build --watch` runs: the process, its modules, the compiled
 * templates, the catalog and the chart shapes are already there once the watch's first
 * rebuild has loaded them (the watch starts with a no-change build, which loads nothing). Each
 * rebuild's own time (its summary line); the watch's 0.2 s wait for more changes is not in it.
 */
async function watchRebuilds(times: number): Promise<number[]> {
  const child = spawn(
    process.execPath,
    [
      CLI,
      'build',
      base.inputDir,
      '--out',
      base.outDir,
      '--config',
      join(root, 'lineledger.yaml'),
      '--watch',
      '--verbose',
      ...cacheArgs,
    ],
    { stdio: ['ignore', 'ignore', 'pipe'] },
  );
  const built: number[] = [];
  let text = '';
  let waiting: (() => void) | null = null;
  child.stderr.setEncoding('utf8');
  child.stderr.on('data', (chunk: string) => {
    text += chunk;
    for (let at = text.indexOf('\n'); at >= 0; at = text.indexOf('\n')) {
      const line = text.slice(0, at);
      text = text.slice(at + 1);
      if (SUMMARY.test(line)) {
        built.push(insideMs(line));
        waiting?.();
      }
    }
  });
  const next = (count: number) =>
    new Promise<void>((resolveNext, reject) => {
      const timer = setTimeout(() => reject(new Error('the watch did not rebuild in 60 s')), 60_000);
      waiting = () => {
        if (built.length < count) return;
        clearTimeout(timer);
        resolveNext();
      };
      waiting();
    });
  try {
    await next(1); // The first build (nothing changed since the last one).
    for (let i = 0; i < times; i++) {
      await new Promise((r) => setTimeout(r, 500));
      appendFileSync(touchedFile, `# touched in watch mode ${i}\n`);
      await next(2 + i);
    }
  } finally {
    child.kill('SIGINT');
  }
  return built.slice(1);
}
const watched = await watchRebuilds(4);
// The median of the rebuilds after the first (which loads the pipeline: shown apart).
const watchOne = [...watched.slice(1)].sort((a, b) => a - b)[1] as number;
process.stdout.write(
  `${'one touched, build --watch running'.padEnd(36)} ${(watchOne / 1000).toFixed(2).padStart(8)} s  (inside each rebuild: first ${watched[0]} ms, then ${watched.slice(1).join(', ')} ms)\n`,
);
// Parallel means one thread per core (at least 2), whatever `--jobs auto` would pick here.
const threads = Math.max(2, availableParallelism());
// Serial and parallel builds alternate, so a change in the machine's load hits both alike.
const serialRuns: number[] = [];
const parallelRuns: number[] = [];
for (let r = 0; r < repeat; r++) {
  serialRuns.push(timed(`serial, no cache (--jobs 1) #${r + 1}`, ['--no-cache', '--jobs', '1']));
  parallelRuns.push(
    timed(`parallel, no cache (--jobs ${threads}) #${r + 1}`, ['--no-cache', '--jobs', String(threads)]),
  );
}
const median = (xs: number[]) =>
  quantile(
    [...xs].sort((a, b) => a - b),
    0.5,
  );
const serial = median(serialRuns);
const parallel = median(parallelRuns);
const loadAfter = loadavg()
  .map((l) => l.toFixed(1))
  .join(' ');

// Render-only pass: the per-session work in this thread, with every chart render timed.
const texts = readTemplateTexts();
const ctx = {
  render: {
    catalog,
    templates: compileTemplates(texts),
    settings: base.settings,
    programVersion: PROGRAM_VERSION,
    buildOptions: 'lineledger build (default options)',
    builtOn: null,
  },
  instrumentDefaults: config.defaultInstrument,
};
const timer = new ChartTimer();
const p0 = performance.now();
for (const f of files) await processSession(f, readFileSync(f), ctx, timer);
const passMs = performance.now() - p0;
const chartMs = timer.ms.reduce((a, b) => a + b, 0);
const charts = timer.ms.length;
const cores = availableParallelism();

const perSession = serial / count;
const bound = 1.3 * (chartMs / cores) + startup;
process.stdout.write(
  [
    '',
    `load after the builds: ${loadAfter}`,
    `serial / parallel (median of ${repeat}):   ${(serial / 1000).toFixed(2)} s / ${(parallel / 1000).toFixed(2)} s`,
    `parallel speed-up (serial / parallel): ${(serial / parallel).toFixed(2)}×  (target ≥ 1.7× on 2 idle cores; --jobs auto here: ${autoJobs(count)} thread(s))`,
    `median chart:                          ${quantile(
      [...timer.ms].sort((a, b) => a - b),
      0.5,
    ).toFixed(2)} ms  (target ≤ 5 ms; ${describeTimes(timer.ms)})`,
    `no-change rebuild / full build:        ${pct(none, full)}  (target ≤ 3 %)`,
    `one touched / full build:              ${pct(one, full)}  (target ≤ 4 %; one session serially: ${perSession.toFixed(0)} ms on average)`,
    `one touched in watch mode / full build: ${pct(watchOne, full)}  (the rebuild's own time, median of the 2nd to 4th)`,
    `inside the build (start-up excluded): no change ${pct(inside[1] as number, inside[0] as number)}, ` +
      `one touched ${pct(inside[2] as number, inside[0] as number)} of the full build`,
    `full build / (1.3 × charts ÷ ${cores} cores + start-up): ${(full / bound).toFixed(2)}  (target ≤ 1)`,
    `render-only pass: ${(passMs / 1000).toFixed(2)} s for ${count} sessions, ${charts} charts rendered in ${(chartMs / 1000).toFixed(2)} s`,
    `share of per-session work in charts:   ${pct(chartMs, passMs)}`,
    '',
  ].join('\n'),
);
rmSync(work, { recursive: true, force: true });
