/**
 * Vega's expression code generator with its functions kept between Views. Each new View turns
 * the code strings of its runtime (encoders, expressions, accessors) into functions with
 * `Function(...)`; a build of hundreds of charts of a few shapes made the same functions over
 * and over, and V8 compiled and optimised each copy again (measured: about a quarter of the
 * CPU of a serial build went to background compilation; docs/archive.md). Here each code
 * string is made into a function once per program and every View gets its own bound copy of
 * it (bound to that View's expression functions, as Vega binds them), so the properties Vega
 * sets on a function (field names) stay per View and the compiled code is shared.
 *
 * The generator itself is Vega's own (read from a runtime context, `vega.runtimeContext`), so
 * the code and its meaning are unchanged; test/charts.test.ts checks the SVG byte for byte.
 */
import type * as VegaModule from 'vega';

type Fn = (...args: unknown[]) => unknown;
interface Ctx {
  functions?: object;
}
type Gen = (ctx: Ctx | null, spec: unknown) => Fn;
interface Codegen {
  operator: Gen;
  parameter: Gen;
  event: Gen;
  handler: Gen;
  encode: Gen;
  codegen: {
    get: (path: readonly string[]) => Fn & { path?: string };
    comparator: (fields: readonly (Fn & { path?: string })[], orders: readonly number[]) => Fn;
  };
}

/** A few hundred per chart shape. */
const MAX_FUNCTIONS = 50_000;

/** A fresh function object calling `f` with `self` as `this`: Vega may set properties on it. */
const fresh = (f: Fn, self: object | undefined): Fn => f.bind(self);

/** How many functions the shared generators hold (for tests: a known shape adds none). */
export let sharedFunctionCount = 0;

export function sharedCodegen(vega: typeof VegaModule): Codegen {
  // Vega's default generator, as a context made without one holds it.
  const { runtimeContext } = vega as unknown as {
    runtimeContext: (df: unknown, transforms: unknown, functions: unknown) => { expr: Codegen };
  };
  const probe = runtimeContext({ events: () => null }, {}, undefined);
  const base = probe.expr;
  const made = new Map<string, Fn>();
  const once = (key: string, make: () => Fn): Fn => {
    let f = made.get(key);
    if (f === undefined) {
      // Bounded: charts of ever new shapes must not grow memory without end.
      if (made.size >= MAX_FUNCTIONS) made.clear();
      f = make();
      made.set(key, f);
      sharedFunctionCount = made.size;
    }
    return f;
  };
  // The generators read only the spec's code (and an encoder's mark type and channel names),
  // so its JSON names the function; made without a context, it comes back unbound.
  // A shape's parsed runtime is kept and never changed, so the Views built from it pass the
  // same spec objects again: those are looked up by identity before any JSON is made.
  const kind = (name: 'operator' | 'parameter' | 'event' | 'handler' | 'encode'): Gen => {
    const seen = new WeakMap<object, Fn>();
    return (ctx, spec) => {
      const known = typeof spec === 'object' && spec !== null ? seen.get(spec) : undefined;
      const shared = known ?? once(`${name}:${JSON.stringify(spec)}`, () => base[name](null, spec));
      if (known === undefined && typeof spec === 'object' && spec !== null) seen.set(spec, shared);
      return fresh(shared, ctx?.functions);
    };
  };
  return {
    operator: kind('operator'),
    parameter: kind('parameter'),
    event: kind('event'),
    handler: kind('handler'),
    encode: kind('encode'),
    codegen: {
      get(path) {
        const shared = once(`get:${JSON.stringify(path)}`, () => base.codegen.get(path));
        const f = fresh(shared, undefined) as Fn & { path?: string };
        f.path = (shared as Fn & { path?: string }).path;
        return f;
      },
      comparator(fields, orders) {
        // Only comparators of plain field paths are code alone; others hold their accessors.
        if (!fields.every((f) => typeof f.path === 'string')) return base.codegen.comparator(fields, orders);
        const key = `cmp:${JSON.stringify([fields.map((f) => f.path), orders])}`;
        return fresh(
          once(key, () => base.codegen.comparator(fields, orders)),
          undefined,
        );
      },
    },
  };
}
