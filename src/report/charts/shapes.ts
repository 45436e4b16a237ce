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
 * inline values too. Explicit scale domains (the wavelength range, the species of a colour
 * scale) come out the same way, one placeholder list per distinct domain, and become signals
 * that each chart sets (view.signal) before its first run: charts of one kind from sessions
 * with other ranges or other species still share a shape. A View is never reused for a second chart: a reused View keeps its old
 * scene items and orders them differently. The output is checked byte for byte against a
 * full compile in test/charts.test.ts.
 */
import type { Runtime } from 'vega';
import type { TopLevelSpec } from 'vega-lite';

/** A key no chart's rows use (the placeholder row's one field). */
const SLOT = '__lineledger_data_slot';
/** Scale domains are taken out too: the wavelength range and the species differ from chart to chart. */
const DOMAIN_TEXT = '__lineledger_domain_';
/** Numeric domain placeholders: integers no chart's wavelengths or scores come near. */
const DOMAIN_NUMBER = 7_340_000_000_000;

type Domain = readonly (number | string)[];

/** Placeholder of value `i` of domain `slot`, of the value's own type (Vega-Lite checks types). */
function domainPlaceholder(value: number | string, slot: number, i: number): number | string {
  return typeof value === 'number' ? DOMAIN_NUMBER + slot * 1000 + i : `${DOMAIN_TEXT}${slot}_${i}`;
}

/** An explicit domain this path can take out: a short list of numbers or of strings. */
function plainDomain(d: unknown): d is Domain {
  return (
    Array.isArray(d) &&
    d.length > 0 &&
    d.length < 1000 &&
    (d.every((v) => typeof v === 'number' && Number.isFinite(v)) || d.every((v) => typeof v === 'string'))
  );
}

export interface ShapedSpec {
  /** The spec with each non-empty inline `values` replaced by a placeholder row. */
  shape: TopLevelSpec;
  /** JSON of the shape: charts with equal keys share one compile. */
  key: string;
  /** The rows of each placeholder, by its number. */
  values: readonly (readonly unknown[])[];
  /** The explicit scale domains taken out, by number (each as the chart gives it). */
  domains: readonly Domain[];
}

/**
 * Takes the inline data out of a spec. The description goes too: Vega writes it nowhere in
 * the SVG (render.ts puts it there itself), so charts differing only in it share a shape.
 * Empty data stay in the shape as they are: all empty sources are alike to Vega-Lite.
 */
/** Numbers things by their JSON: equal contents get one number (one placeholder). */
class Slots<T> {
  readonly items: T[] = [];
  private readonly byContent = new Map<string, number>();
  of(item: T): number {
    const content = JSON.stringify(item);
    let slot = this.byContent.get(content);
    if (slot === undefined) {
      slot = this.items.length;
      this.byContent.set(content, slot);
      this.items.push(item);
    }
    return slot;
  }
}

export function shapeOf(spec: TopLevelSpec): ShapedSpec {
  const rowSlots = new Slots<readonly unknown[]>();
  // Equal domains share one placeholder, so Vega-Lite merges their scales as before.
  const domainSlots = new Slots<Domain>();
  const walk = (x: unknown, key = ''): unknown => {
    if (Array.isArray(x)) return x.map((e) => walk(e));
    if (x === null || typeof x !== 'object') return x;
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(x)) {
      const rows =
        k === 'data' && v !== null && typeof v === 'object' ? (v as { values?: unknown }).values : null;
      if (Array.isArray(rows) && rows.length > 0) {
        out[k] = { ...(v as object), values: [{ [SLOT]: rowSlots.of(rows) }] };
      } else if (key === 'scale' && k === 'domain' && plainDomain(v)) {
        const slot = domainSlots.of(v);
        out[k] = v.map((value, i) => domainPlaceholder(value, slot, i));
      } else out[k] = walk(v, k);
    }
    return out;
  };
  const shape = walk(spec) as Record<string, unknown>;
  delete shape.description;
  return {
    shape: shape as unknown as TopLevelSpec,
    key: JSON.stringify(shape),
    values: rowSlots.items,
    domains: domainSlots.items,
  };
}

export interface CompiledShape {
  runtime: Runtime;
  /** Vega data source name → placeholder number. */
  sources: [string, number][];
  /** Vega signal name → domain number: each chart sets its own domain there. */
  domainSignals: [string, number][];
}

/** The signal standing for domain `slot` in the compiled spec. */
const domainSignal = (slot: number) => `${DOMAIN_TEXT}${slot}`;

/**
 * Replaces each domain placeholder list in the compiled Vega spec (a scale's `domain`) by a
 * signal, added to the top-level signals, or returns null when a placeholder value shows up
 * anywhere else (folded into an expression, an axis, a legend): the chart is then drawn in full.
 */
export function detachDomains(
  vegaSpec: { signals?: { name: string; value?: unknown }[] },
  domains: readonly Domain[],
): [string, number][] | null {
  if (domains.length === 0) return [];
  const expected = domains.map((d, slot) => JSON.stringify(d.map((v, i) => domainPlaceholder(v, slot, i))));
  const found = new Set<number>();
  const visit = (x: unknown): void => {
    if (Array.isArray(x)) {
      for (const e of x) visit(e);
      return;
    }
    if (x === null || typeof x !== 'object') return;
    const o = x as Record<string, unknown>;
    for (const [k, v] of Object.entries(o)) {
      // A scale's domain, or a legend's values copied from it.
      const slot =
        (k === 'domain' || k === 'values') && Array.isArray(v) ? expected.indexOf(JSON.stringify(v)) : -1;
      if (slot >= 0) {
        o[k] = { signal: domainSignal(slot) };
        found.add(slot);
      } else visit(v);
    }
  };
  visit(vegaSpec);
  if (found.size !== domains.length) return null;
  const text = JSON.stringify(vegaSpec);
  // Every placeholder value must be gone (only the signals' names, which hold no value, remain).
  for (const [slot, d] of domains.entries())
    for (let i = 0; i < d.length; i++) {
      const p = domainPlaceholder(d[i] as number | string, slot, i);
      if (text.includes(typeof p === 'number' ? String(p) : JSON.stringify(p))) return null;
    }
  vegaSpec.signals = [
    ...(vegaSpec.signals ?? []),
    ...domains.map((d, slot) => ({ name: domainSignal(slot), value: [...d] })),
  ];
  return domains.map((_, slot) => [domainSignal(slot), slot]);
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
