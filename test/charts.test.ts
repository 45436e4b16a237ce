/**
 * Charts rendered from a shared compiled shape are the same bytes as charts rendered the
 * plain way. The reference is the libraries themselves (vega-lite 6.4.3 compile, vega 6.2.0
 * parse and SVG string renderer, from the npm registry) run on each spec alone, as render.ts
 * did before shapes were shared. The specs are the real ones of the demo sessions
 * (data/sessions) and of an archive generated from them (scripts/make-archive.ts: same shapes,
 * other numbers), so shapes are reused across sessions as in a build.
 */
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TopLevelSpec } from 'vega-lite';
import { describe, expect, it, vi } from 'vitest';
import { makeArchive } from '../scripts/make-archive.js';
import { readTemplateTexts } from '../src/build.js';
import { loadCatalogFor, loadConfig } from '../src/commands/common.js';
import { processSession } from '../src/parallel/unit.js';
import * as codegen from '../src/report/charts/codegen.js';
import { chartRenderStats, renderChart, renderChartInFull } from '../src/report/charts/render.js';
import { shapeOf } from '../src/report/charts/shapes.js';
import { overviewChart } from '../src/report/charts/specs.js';
import { compileTemplates } from '../src/report/templates.js';

/** Every spec the session pages ask for, with the SVG the page got. */
const asked = vi.hoisted(() => [] as { spec: unknown; svg: string }[]);
vi.mock('../src/report/charts/render.js', async (importOriginal) => {
  const real = await importOriginal<typeof import('../src/report/charts/render.js')>();
  return {
    ...real,
    renderChart: async (spec: TopLevelSpec, cache?: Map<string, string>) => {
      const copy = structuredClone(spec);
      const out = await real.renderChart(spec, cache);
      asked.push({ spec: copy, svg: out.svg });
      return out;
    },
  };
});

const config = loadConfig('lineledger.yaml');
const catalog = loadCatalogFor(config);
const ctx = {
  render: {
    catalog,
    templates: compileTemplates(readTemplateTexts()),
    settings: { title: config.title, owner: config.owner, introMarkdown: config.introMarkdown },
    programVersion: 'test',
    buildOptions: 'lineledger build (default options)',
    builtOn: null,
  },
  instrumentDefaults: config.defaultInstrument,
};

function kindOf(spec: TopLevelSpec): string {
  const s = JSON.stringify(spec);
  if (s.includes('"Reference (below axis)"')) return 'spectrum';
  if (s.includes('"Residual (nm)"') && s.includes('"Pixel"')) return 'calibration';
  if (s.includes('"Residual (nm)"')) return 'residual';
  if (s.includes('Evidence score (natural log')) return 'score';
  if (s.includes('"Redshift z"')) return 'scan';
  return 'other';
}

describe('charts from shared shapes', () => {
  it('give the same SVG bytes as a full compile, for every chart of the demo and a generated archive', async () => {
    const demo = readdirSync('data/sessions')
      .filter((n) => n.endsWith('.yaml'))
      .sort()
      .map((n) => join('data/sessions', n));
    // Three variants of each demo session: the shapes repeat with other rows.
    const archive = makeArchive(join(mkdtempSync(join(tmpdir(), 'll-charts-')), 'sessions'), 24);
    const before = chartRenderStats();
    for (const f of [...demo, ...archive]) await processSession(f, readFileSync(f), ctx, new Map());
    const after = chartRenderStats();
    expect(asked.length).toBeGreaterThan(4 * demo.length);
    // All of them were drawn from a shared shape (none fell back to the full path), far fewer compiled.
    expect(after.fromShape - before.fromShape).toBe(asked.length);
    expect(after.inFull - before.inFull).toBe(0);
    expect(after.shapesCompiled - before.shapesCompiled).toBeLessThan(asked.length / 2);
    const kinds = new Map<string, number>();
    for (const { spec, svg } of asked) {
      const s = spec as TopLevelSpec;
      kinds.set(kindOf(s), (kinds.get(kindOf(s)) ?? 0) + 1);
      expect(svg, s.description).toBe(await renderChartInFull(s));
    }
    // A chart of a known shape with other rows makes no new Vega function: they are shared.
    const known = asked.find(({ spec }) => kindOf(spec as TopLevelSpec) === 'score')?.spec as TopLevelSpec;
    const functions = codegen.sharedFunctionCount;
    expect(functions).toBeGreaterThan(0);
    const other = structuredClone(known) as { data: { values: { score: number }[] } };
    for (const row of other.data.values) row.score += 0.25;
    const again = other as unknown as TopLevelSpec;
    expect((await renderChart(again)).svg).toBe(await renderChartInFull(again));
    expect(codegen.sharedFunctionCount).toBe(functions);
    // Each kind of session chart is among them.
    for (const k of ['spectrum', 'residual', 'score', 'calibration', 'scan'])
      expect(kinds.get(k) ?? 0, k).toBeGreaterThan(0);
  });

  it('give the same bytes for the overview chart and for charts with empty or repeated data', async () => {
    const specs: TopLevelSpec[] = [
      overviewChart('Species by session', [
        { session: 'tube-b', species: 'Hg I' },
        { session: 'tube-d', species: 'He I' },
        { session: 'tube-d', species: 'Hg I' },
      ]),
      overviewChart('Species by session (other rows)', [{ session: 'vega', species: 'H I' }]),
      overviewChart('Nothing found', []),
    ];
    for (const spec of specs) expect((await renderChart(spec)).svg).toBe(await renderChartInFull(spec));
  });

  it('take the data out of the shape, one placeholder per distinct content, empty data kept', () => {
    const rows = [{ a: 1 }];
    const spec = {
      description: 'd',
      vconcat: [
        { data: { values: rows }, mark: 'point' },
        { data: { values: [{ a: 1 }] }, mark: 'point' },
        { data: { values: [{ a: 2 }] }, mark: 'point' },
        { data: { values: [] }, mark: 'point' },
      ],
    } as unknown as TopLevelSpec;
    const shaped = shapeOf(spec);
    expect(shaped.values).toEqual([[{ a: 1 }], [{ a: 2 }]]);
    expect(shaped.key).not.toContain('"description"');
    expect(shaped.key).toContain('"values":[]');
    const other = shapeOf({ ...spec, description: 'e' } as TopLevelSpec);
    expect(other.key).toBe(shaped.key);
  });

  it('take explicit scale domains out too, equal ones once, and draw other ranges and species the same as a full compile', async () => {
    const chart = (lo: number, hi: number, species: string[]) =>
      ({
        data: {
          values: species.map((s, i) => ({ x: lo + (i + 1) * ((hi - lo) / (species.length + 1)), s })),
        },
        layer: [
          {
            mark: 'tick',
            encoding: {
              x: { field: 'x', type: 'quantitative', scale: { domain: [lo, hi], zero: false, nice: false } },
              color: { field: 's', type: 'nominal', scale: { domain: species } },
            },
          },
          {
            mark: 'point',
            encoding: { x: { field: 'x', type: 'quantitative', scale: { domain: [lo, hi] } } },
          },
        ],
      }) as unknown as TopLevelSpec;
    const a = shapeOf(chart(400, 700, ['Hg I', 'Ne I']));
    const b = shapeOf(chart(380, 720, ['He I', 'Ar I']));
    expect(a.domains).toEqual([
      [400, 700],
      ['Hg I', 'Ne I'],
    ]);
    expect(b.key).toBe(a.key);
    const before = chartRenderStats();
    for (const spec of [chart(400, 700, ['Hg I', 'Ne I']), chart(380, 720, ['He I', 'Ar I'])])
      expect((await renderChart(spec)).svg).toBe(await renderChartInFull(spec));
    const after = chartRenderStats();
    // Both drawn from one compiled shape, neither in full.
    expect(after.fromShape - before.fromShape).toBe(2);
    expect(after.shapesCompiled - before.shapesCompiled).toBe(1);
  });
});
