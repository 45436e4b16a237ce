/**
 * Chart bench (part of npm run bench; alone: tsx scripts/bench-charts.ts [N]): the charts of
 * an archive of N generated sessions (default 300), each timed from the chart cache's miss to
 * its store (exactly one renderChart call), rendered the plain way (every chart compiled and
 * parsed alone) and then from shared shapes (starting with none compiled, so the compiles
 * count). Prints median, mean and 90th percentile per chart; asserts nothing.
 */

import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readTemplateTexts } from '../src/build.js';
import { loadCatalogFor, loadConfig } from '../src/commands/common.js';
import { processSession } from '../src/parallel/unit.js';
import { chartRenderStats, shareChartShapes } from '../src/report/charts/render.js';
import { compileTemplates } from '../src/report/templates.js';
import { makeArchive } from './make-archive.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');

/** A chart cache that never hits and notes how long each chart took from miss to store. */
export class ChartTimer extends Map<string, string> {
  readonly ms: number[] = [];
  private readonly started = new Map<string, number>();
  override get(k: string) {
    const hit = super.get(k);
    if (hit === undefined) this.started.set(k, performance.now());
    return hit;
  }
  override set(k: string, v: string) {
    const t = this.started.get(k);
    if (t !== undefined) {
      this.ms.push(performance.now() - t);
      this.started.delete(k);
    }
    return super.set(k, v);
  }
}

export function quantile(sorted: readonly number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? Number.NaN;
}

export function describeTimes(ms: readonly number[]): string {
  const s = [...ms].sort((a, b) => a - b);
  const mean = s.reduce((a, b) => a + b, 0) / Math.max(1, s.length);
  return `median ${quantile(s, 0.5).toFixed(2)} ms, mean ${mean.toFixed(2)} ms, p90 ${quantile(s, 0.9).toFixed(2)} ms`;
}

async function main() {
  const count = Number(process.argv[2] ?? process.env.BENCH_SESSIONS ?? 300);
  const work = mkdtempSync(join(tmpdir(), 'll-bench-charts-'));
  const files = makeArchive(join(work, 'sessions'), count);
  const config = loadConfig(join(root, 'lineledger.yaml'));
  const ctx = {
    render: {
      catalog: loadCatalogFor(config),
      templates: compileTemplates(readTemplateTexts()),
      settings: { title: config.title, owner: config.owner, introMarkdown: config.introMarkdown },
      programVersion: 'bench',
      buildOptions: 'lineledger build (default options)',
      builtOn: null,
    },
    instrumentDefaults: config.defaultInstrument,
  };
  const pass = async (shared: boolean) => {
    shareChartShapes(shared);
    const before = chartRenderStats();
    const timer = new ChartTimer();
    for (const f of files) await processSession(f, readFileSync(f), ctx, timer);
    const after = chartRenderStats();
    return {
      ms: timer.ms,
      compiled: after.shapesCompiled - before.shapesCompiled,
      full: after.inFull - before.inFull,
    };
  };
  process.stdout.write(
    `chart bench: ${count} sessions, load ${loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}\n`,
  );
  // Loads the libraries and warms the code up: neither is a chart's cost.
  await pass(false);
  const plain = await pass(false);
  const shared = await pass(true);
  const total = (ms: number[]) => (ms.reduce((a, b) => a + b, 0) / 1000).toFixed(2);
  process.stdout.write(
    [
      `charts, each compiled alone:   ${plain.ms.length} charts, ${total(plain.ms)} s; ${describeTimes(plain.ms)}`,
      `charts, from shared shapes:    ${shared.ms.length} charts, ${total(shared.ms)} s; ${describeTimes(shared.ms)} ` +
        `(${shared.compiled} shapes compiled, ${shared.full} charts drawn in full)`,
      '',
    ].join('\n'),
  );
  rmSync(work, { recursive: true, force: true });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) await main();
