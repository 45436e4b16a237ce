/**
 * Vega-Lite spec → inline SVG at build time (vega-lite compiles, vega renders headless with
 * its SVG string renderer), so pages need no script. Element ids are rewritten with a prefix
 * derived from the spec's hash: several charts share one page and ids must stay unique, and
 * the same spec must always give the same bytes.
 */
import { createHash } from 'node:crypto';
import type { TopLevelSpec } from 'vega-lite';

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
  const [vega, vegaLite] = await loadChartLibraries();
  const vg = vegaLite.compile(spec).spec;
  const view = new vega.View(vega.parse(vg), { renderer: 'none' });
  const raw = await view.toSVG();
  view.finalize();
  const svg = labelled(
    stabiliseIds(raw, hash.slice(0, 8)),
    typeof spec.description === 'string' ? spec.description : 'Chart',
  );
  cache?.set(hash, svg);
  return { svg, hash };
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
