/**
 * Vega-Lite spec → inline SVG at build time (vega-lite compiles, vega renders headless with
 * its SVG string renderer), so pages need no script. Element ids are rewritten with a prefix
 * derived from the spec's hash: several charts share one page and ids must stay unique, and
 * the same spec must always give the same bytes. Charts of one shape share one compile and
 * parse (shapes.ts) and Vega's generated functions (codegen.ts); the SVG is the same as a
 * compile of each chart alone.
 */
import { createHash } from 'node:crypto';
import type { TopLevelSpec } from 'vega-lite';
import { sharedCodegen } from './codegen.js';
import { type CompiledShape, detachDomains, detachPlaceholders, type ShapedSpec, shapeOf } from './shapes.js';

/** vega and vega-lite take a quarter of a second to load: only a chart not in the cache needs them. */
let chartLibraries: Promise<[typeof import('vega'), typeof import('vega-lite')]> | null = null;
function loadChartLibraries() {
  chartLibraries ??= Promise.all([import('vega'), import('vega-lite')]);
  return chartLibraries;
}

export interface RenderedChart {
  svg: string;
  hash: string;
}

export type ChartCache = Map<string, string>;

export function specHash(spec: TopLevelSpec): string {
  return createHash('sha256').update(JSON.stringify(spec)).digest('hex').slice(0, 16);
}

export async function renderChart(spec: TopLevelSpec, cache?: ChartCache): Promise<RenderedChart> {
  const hash = specHash(spec);
  const hit = cache?.get(hash);
  if (hit !== undefined) return { svg: hit, hash };
  let raw = sharedShapes ? await vegaSvgByShape(spec) : null;
  if (raw === null) {
    stats.inFull++;
    raw = await vegaSvgInFull(spec);
  } else stats.fromShape++;
  const svg = finish(raw, spec, hash);
  cache?.set(hash, svg);
  return { svg, hash };
}

/** The page's SVG of a chart rendered the plain way: a full compile and parse of this spec alone. */
export async function renderChartInFull(spec: TopLevelSpec): Promise<string> {
  return finish(await vegaSvgInFull(spec), spec, specHash(spec));
}

function finish(raw: string, spec: TopLevelSpec, hash: string): string {
  return labelled(
    stabiliseIds(raw, hash.slice(0, 8)),
    typeof spec.description === 'string' ? spec.description : 'Chart',
  );
}

async function vegaSvgInFull(spec: TopLevelSpec): Promise<string> {
  const [vega, vegaLite] = await loadChartLibraries();
  const view = new vega.View(vega.parse(vegaLite.compile(spec).spec), { renderer: 'none' });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

/**
 * Compiled shapes of this program, oldest first. A few dozen in an archive of demo-like
 * sessions; bounded so that an archive of all-different charts does not grow memory.
 */
const compiled = new Map<string, Promise<CompiledShape | null>>();
/** Vega's expression functions, made once per program (codegen.ts). */
let codegen: ReturnType<typeof sharedCodegen> | null = null;
const MAX_SHAPES = 256;

/** What the renders of this program cost: shapes compiled, charts drawn from a shape, charts drawn in full. */
export interface ChartRenderStats {
  shapesCompiled: number;
  fromShape: number;
  inFull: number;
}
const stats: ChartRenderStats = { shapesCompiled: 0, fromShape: 0, inFull: 0 };
export function chartRenderStats(): ChartRenderStats {
  return { ...stats };
}

let sharedShapes = true;
/**
 * Off: every chart is compiled and parsed alone, as before shapes were shared. Only for the
 * chart bench (scripts/bench-charts.ts), which times both ways in one program.
 */
export function shareChartShapes(on: boolean): void {
  sharedShapes = on;
  if (!on) compiled.clear();
}

async function compileShape(
  shape: TopLevelSpec,
  slots: number,
  domains: ShapedSpec['domains'],
): Promise<CompiledShape | null> {
  const [vega, vegaLite] = await loadChartLibraries();
  try {
    const vegaSpec = vegaLite.compile(shape).spec;
    const sources = detachPlaceholders(vegaSpec as Parameters<typeof detachPlaceholders>[0], slots);
    const domainSignals = sources && detachDomains(vegaSpec as Parameters<typeof detachDomains>[0], domains);
    return sources === null || domainSignals === null
      ? null
      : { runtime: vega.parse(vegaSpec), sources, domainSignals };
  } catch {
    // The full render of the chart itself then says what is wrong with it.
    return null;
  }
}

/** The chart from its shape's parsed runtime and its own rows; null when the shape cannot be shared. */
async function vegaSvgByShape(spec: TopLevelSpec): Promise<string | null> {
  const { shape, key, values, domains } = shapeOf(spec);
  let entry = compiled.get(key);
  if (entry === undefined) {
    entry = compileShape(shape, values.length, domains);
    stats.shapesCompiled++;
    compiled.set(key, entry);
    if (compiled.size > MAX_SHAPES) compiled.delete(compiled.keys().next().value as string);
  }
  const ready = await entry;
  if (ready === null) return null;
  const [vega] = await loadChartLibraries();
  codegen ??= sharedCodegen(vega);
  const view = new vega.View(ready.runtime, { renderer: 'none', expr: codegen });
  try {
    // Fresh rows: Vega marks the objects it ingests, and the caller's spec stays as it was.
    for (const [name, slot] of ready.domainSignals) view.signal(name, [...(domains[slot] as unknown[])]);
    for (const [name, slot] of ready.sources) view.data(name, (values[slot] as unknown[]).map(ownCopy));
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

function ownCopy(row: unknown): unknown {
  if (row === null || typeof row !== 'object') return row;
  const out: Record<string, unknown> = {};
  for (const k of Object.keys(row)) out[k] = (row as Record<string, unknown>)[k];
  return out;
}

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** The chart as one image with a text alternative (its description). */
function labelled(svg: string, description: string): string {
  const text = escapeXml(description);
  // Inner graphics roles would make each mark container an unlabelled image of its own.
  return svg
    .replace(/\srole="graphics-[^"]*"/g, '')
    .replace(/\saria-roledescription="[^"]*"/g, '')
    .replace(/^<svg([^>]*)>/, `<svg$1 role="img" aria-label="${text}"><title>${text}</title>`);
}

function stabiliseIds(svg: string, prefix: string): string {
  const ids = new Map<string, string>();
  svg.replace(/\sid="([^"]+)"/g, (_m, id: string) => {
    if (!ids.has(id)) ids.set(id, `c${prefix}-${ids.size}`);
    return '';
  });
  let out = svg;
  for (const [id, next] of ids) {
    const escaped = id.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
    out = out
      .replace(new RegExp(`id="${escaped}"`, 'g'), `id="${next}"`)
      .replace(new RegExp(`url\\(#${escaped}\\)`, 'g'), `url(#${next})`)
      .replace(new RegExp(`href="#${escaped}"`, 'g'), `href="#${next}"`);
  }
  return out;
}
