/**
 * Chart shapes: a Vega-Lite spec with its inline data taken out. Charts of one shape (the
 * same marks, scales, titles and domains, other numbers) share one Vega-Lite compile and one
 * Vega parse; each chart then only builds a View from the parsed runtime and inserts its
 * rows (Vega's `view.data`). Compile and parse are most of a chart's cost (measured in
 * scripts/bench-charts.ts) and the charts of an archive repeat a handful of shapes.
 *
 * The data are replaced by one-row placeholders, one per distinct content, so Vega-Lite merges
 * and names its data sources exactly as it does for the real rows (it merges equal inline
 * data); the placeholders are then removed from the compiled Vega spec and the real rows
 * inserted under the same source names before the first run, which is what Vega does with
 * inline values too. A View is never reused for a second chart: a reused View keeps its old
 * scene items and orders them differently. The output is checked byte for byte against a
 * full compile in test/charts.test.ts.
 */
import type { Runtime } from 'vega';
import type { TopLevelSpec } from 'vega-lite';

/** A key no chart's rows use (the placeholder row's one field). */
const SLOT = '__lineledger_data_slot';

export interface ShapedSpec {
  /** The spec with each non-empty inline `values` replaced by a placeholder row. */
  shape: TopLevelSpec;
  /** JSON of the shape: charts with equal keys share one compile. */
  key: string;
  /** The rows of each placeholder, by its number. */
  values: readonly (readonly unknown[])[];
}

/**
 * Takes the inline data out of a spec. The description goes too: Vega writes it nowhere in
 * the SVG (render.ts puts it there itself), so charts differing only in it share a shape.
 * Empty data stay in the shape as they are: all empty sources are alike to Vega-Lite.
 */
export function shapeOf(spec: TopLevelSpec): ShapedSpec {
  const byContent = new Map<string, number>();
  const values: (readonly unknown[])[] = [];
  const walk = (x: unknown): unknown => {
    if (Array.isArray(x)) return x.map(walk);
    if (x === null || typeof x !== 'object') return x;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(x)) {
      const rows =
        k === 'data' && v !== null && typeof v === 'object' ? (v as { values?: unknown }).values : null;
      if (Array.isArray(rows) && rows.length > 0) {
        const content = JSON.stringify(rows);
        let slot = byContent.get(content);
        if (slot === undefined) {
          slot = values.length;
          byContent.set(content, slot);
          values.push(rows);
        }
        out[k] = { ...(v as object), values: [{ [SLOT]: slot }] };
      } else out[k] = walk(v);
    }
    return out;
  };
  const shape = walk(spec) as Record<string, unknown>;
  delete shape.description;
  return { shape: shape as unknown as TopLevelSpec, key: JSON.stringify(shape), values };
}

export interface CompiledShape {
  runtime: Runtime;
  /** Vega data source name → placeholder number. */
  sources: [string, number][];
}

interface VegaData {
  name: string;
  values?: unknown;
  format?: unknown;
}

/** A format that reads rows as they are (none, `{}` or JSON without parse): inserting them is the same. */
function plainFormat(format: unknown): boolean {
  if (format === undefined) return true;
  if (format === null || typeof format !== 'object') return false;
  return Object.entries(format).every(([k, v]) => k === 'type' && v === 'json');
}

/**
 * The compiled Vega spec of a shape, its placeholders removed, or null when the shape is not
 * one this path is sure of (a placeholder not found as one plain inline source, or a source
 * that Vega would parse on reading): the caller then renders the chart in full.
 */
export function detachPlaceholders(
  vegaSpec: { data?: VegaData[] },
  slots: number,
): [string, number][] | null {
  const sources: [string, number][] = [];
  for (const d of vegaSpec.data ?? []) {
    const rows = d.values;
    if (!Array.isArray(rows) || rows.length !== 1) continue;
    const row = rows[0] as Record<string, unknown> | null;
    if (row === null || typeof row !== 'object' || !(SLOT in row)) continue;
    if (!plainFormat(d.format) || Object.keys(row).length !== 1) return null;
    sources.push([d.name, row[SLOT] as number]);
  }
  const found = new Set(sources.map(([, s]) => s));
  if (found.size !== slots || sources.length !== slots) return null;
  for (const d of vegaSpec.data ?? []) if (sources.some(([n]) => n === d.name)) delete d.values;
  // A placeholder anywhere else (a field folded into an expression) would be wrong data.
  if (JSON.stringify(vegaSpec).includes(SLOT)) return null;
  return sources;
}
