/**
 * Build benchmark (npm run bench [N]): generates an archive of N sessions (default 500, or
 * BENCH_SESSIONS), then times a full build, a no-change rebuild, a rebuild with one session
 * touched and a serial build without cache (each as `node dist/cli.js build`, process start
 * included), and measures the share of the work spent rendering
 * charts in a render-only pass (a chart cache that times each miss from lookup to store, which
 * is exactly one renderChart call). Prints the times and ratios; asserts nothing.
 */

import { spawnSync } from 'node:child_process';
import { appendFileSync, cpSync, mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readTemplateTexts } from '../src/build.js';
import { loadCatalogFor, loadConfig } from '../src/commands/common.js';
import { processSession } from '../src/parallel/unit.js';
import { compileTemplates } from '../src/report/templates.js';
import { PROGRAM_VERSION } from '../src/version.js';
import { makeArchive } from './make-archive.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const count = Number(process.argv[2] ?? process.env.BENCH_SESSIONS ?? 500);
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
const app = join(work, 'app');
cpSync(join(root, 'dist'), join(app, 'dist'), { recursive: true });
cpSync(join(root, 'package.json'), join(app, 'package.json'));
for (const shared of ['node_modules', 'data', 'templates'])
  symlinkSync(join(root, shared), join(app, shared));
const CLI = join(app, 'dist', 'cli.js');

/** Time inside each build (its own summary line), beside the wall-clock time of the process. */
const inside: number[] = [];

/** Times one build as users run it: the compiled command line, in a fresh process. */
function timed(label: string, extra: string[]): number {
  const args = [CLI, 'build', base.inputDir, '--out', base.outDir, '--config', join(root, 'lineledger.yaml')];
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [...args, '--verbose', ...extra], { encoding: 'utf8' });
  const ms = performance.now() - t0;
  const summary =
    /built \d+ of \d+ sessions[^\n]*/.exec(r.stderr)?.[0] ?? `exit ${r.status}: ${r.stderr.slice(-300)}`;
  inside.push(Number(/, (\d+) ms\)/.exec(summary)?.[1] ?? Number.NaN));
  process.stdout.write(
    `${label.padEnd(36)} ${(ms / 1000).toFixed(2).padStart(8)} s  ${summary.replace(/^built /, '')}\n`,
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
const serial = timed('serial build, no cache (--jobs 1)', ['--no-cache', '--jobs', '1']);

// Render-only pass: the per-session work in this thread, with every chart render timed.
let chartMs = 0;
let charts = 0;
const started = new Map<string, number>();
class TimingCache extends Map<string, string> {
  override get(k: string) {
    const hit = super.get(k);
    if (hit === undefined) started.set(k, performance.now());
    return hit;
  }
  override set(k: string, v: string) {
    const t = started.get(k);
    if (t !== undefined) {
      chartMs += performance.now() - t;
      charts++;
      started.delete(k);
    }
    return super.set(k, v);
  }
}
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
const cache = new TimingCache();
const p0 = performance.now();
for (const f of files) await processSession(f, readFileSync(f), ctx, cache);
const passMs = performance.now() - p0;

const perSession = serial / count;
const pct = (a: number, b: number) => `${((100 * a) / b).toFixed(1)} %`;
process.stdout.write(
  [
    '',
    `no-change rebuild / full build:        ${pct(none, full)}  (target < 5 %)`,
    `one touched / full build:              ${pct(one, full)}  (one session serially: ${perSession.toFixed(0)} ms ` +
      `on average; the rebuild minus that: ${pct(one - perSession, full)}, target < 5 %)`,
    `inside the build (start-up excluded): no change ${pct(inside[1] as number, inside[0] as number)}, ` +
      `one touched ${pct(inside[2] as number, inside[0] as number)} of the full build`,
    `parallel speed-up (serial / full):     ${(serial / full).toFixed(2)}×`,
    `render-only pass: ${(passMs / 1000).toFixed(2)} s for ${count} sessions, ${charts} charts rendered in ${(chartMs / 1000).toFixed(2)} s`,
    `share of per-session work in charts:   ${pct(chartMs, passMs)}`,
    `share of the serial build in charts:   ${pct(chartMs, serial)}`,
    '',
  ].join('\n'),
);
rmSync(work, { recursive: true, force: true });
