/**
 * Property-based checks with fast-check (fixed seed, bounded runs): mutated demo sessions
 * never crash the reader or the pipeline, every failure is a placed diagnostic, and the
 * identification does not depend on the order of the lines.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../src/diagnostics.js';
import { runSession } from '../src/pipeline.js';
import { readSessionText } from '../src/session/read.js';
import { bundledCatalog } from './helpers/catalog.js';

const SEED = 20260314;
const DIR = 'data/sessions';
const DEMOS = readdirSync(DIR)
  .filter((f) => /\.ya?ml$/.test(f))
  .sort()
  .map((f) => ({ name: f, text: readFileSync(join(DIR, f), 'utf8') }));

type Mutation = (lines: string[]) => string[];

const scalar = fc.oneof(
  fc.double({ noNaN: false }).map(String),
  fc.integer().map(String),
  fc.constantFrom(
    '~',
    'null',
    'true',
    '""',
    '[]',
    '{}',
    '-0',
    '.inf',
    '1e309',
    '&a x',
    '*a',
    '!!binary x',
    '"\\u0000"',
  ),
  fc.string({ maxLength: 12 }),
);

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.nat().map(
    (i): Mutation =>
      (ls) =>
        ls.filter((_, k) => k !== i % ls.length),
  ),
  fc.nat().map(
    (i): Mutation =>
      (ls) =>
        ls.flatMap((l, k) => (k === i % ls.length ? [l, l] : [l])),
  ),
  fc.tuple(fc.nat(), fc.nat()).map(
    ([i, j]): Mutation =>
      (ls) => {
        const out = [...ls];
        const a = i % ls.length;
        const b = j % ls.length;
        [out[a], out[b]] = [out[b]!, out[a]!];
        return out;
      },
  ),
  fc.tuple(fc.nat(), fc.nat(), fc.string({ minLength: 1, maxLength: 4, unit: 'binary' })).map(
    ([i, at, s]): Mutation =>
      (ls) =>
        ls.map((l, k) =>
          k === i % ls.length ? l.slice(0, at % (l.length + 1)) + s + l.slice(at % (l.length + 1)) : l,
        ),
  ),
  fc.nat().map(
    (n): Mutation =>
      (ls) =>
        ls
          .join('\n')
          .slice(0, n % (ls.join('\n').length + 1))
          .split('\n'),
  ),
  fc.tuple(fc.nat(), scalar).map(
    ([i, v]): Mutation =>
      (ls) => {
        // Replace the value of one `key: value` (block or flow) by a random scalar.
        const k = i % ls.length;
        return ls.map((l, n) => (n === k ? l.replace(/(\w+):\s*[^,}\n]+/, `$1: ${v}`) : l));
      },
  ),
);

const mutated = fc
  .tuple(fc.constantFrom(...DEMOS), fc.array(mutation, { minLength: 1, maxLength: 4 }))
  .map(([demo, ms]) => ({
    name: demo.name,
    text: ms.reduce((ls, m) => m(ls), demo.text.split('\n')).join('\n'),
  }));

function expectPlaced(diagnostics: readonly Diagnostic[], file: string): void {
  for (const d of diagnostics) {
    expect(d.file).toBe(file);
    expect(Number.isInteger(d.line) && d.line >= 1, JSON.stringify(d)).toBe(true);
    expect(Number.isInteger(d.col) && d.col >= 1, JSON.stringify(d)).toBe(true);
    expect(typeof d.message === 'string' && d.message.length > 0).toBe(true);
  }
}

describe('mutated sessions', () => {
  const catalog = bundledCatalog();

  it('never crash the reader; every problem is a placed diagnostic', () => {
    const seen = { read: 0, refused: 0 };
    fc.assert(
      fc.property(mutated, ({ name, text }) => {
        const r = readSessionText(text, name);
        seen[r.ok ? 'read' : 'refused']++;
        if (r.ok) expectPlaced(r.warnings, name);
        else {
          expect(r.diagnostics.length).toBeGreaterThan(0);
          expectPlaced(r.diagnostics, name);
        }
      }),
      { seed: SEED, numRuns: 400 },
    );
    // The mutations must exercise both paths, or the property says nothing.
    expect(seen.read).toBeGreaterThan(20);
    expect(seen.refused).toBeGreaterThan(20);
  });

  it('never crash the whole pipeline; every problem is a placed diagnostic', () => {
    fc.assert(
      fc.property(mutated, ({ name, text }) => {
        const r = runSession(name, text, catalog);
        if (r.ok) expectPlaced(r.warnings, name);
        else {
          expect(r.diagnostics.length).toBeGreaterThan(0);
          expectPlaced(r.diagnostics, name);
        }
      }),
      { seed: SEED, numRuns: 150 },
    );
  });

  it('never crash the reader on arbitrary bytes', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 200 }), (bytes) => {
        const r = readSessionText(bytes, 'bytes.yaml');
        if (!r.ok) expectPlaced(r.diagnostics, 'bytes.yaml');
      }),
      { seed: SEED, numRuns: 300 },
    );
  });
});

/** Where a demo's `lines:` entries (one `  - { … }` per text line) begin and end. */
function linesBlock(ls: readonly string[]): { start: number; end: number } {
  const start = ls.indexOf('lines:') + 1;
  let end = start;
  while (end < ls.length && ls[end]!.startsWith('  - ')) end++;
  return { start, end };
}

/** The demo with its `lines:` entries in a given order. */
function withLineOrder(text: string, order: readonly number[]): string {
  const ls = text.split('\n');
  const { start, end } = linesBlock(ls);
  const entries = ls.slice(start, end);
  return [...ls.slice(0, start), ...order.map((i) => entries[i]!), ...ls.slice(end)].join('\n');
}

function lineCount(text: string): number {
  const { start, end } = linesBlock(text.split('\n'));
  return end - start;
}

/** Assignments keyed by measured wavelength (rounded far below any σ), independent of index. */
function assignmentsByWavelength(name: string, text: string) {
  const r = runSession(name, text, bundledCatalog());
  if (!r.ok) throw new Error(`${name}: ${JSON.stringify(r.diagnostics)}`);
  return {
    species: [...r.identification.explanation.species].sort(),
    lines: r.reduction.lines
      .map((l) => {
        const a = r.identification.lines.find((x) => x.index === l.index)?.assignment ?? null;
        return `${l.vacuum_nm.toFixed(6)} → ${a ? `${a.species} ${a.ref_vacuum_nm.toFixed(6)}` : 'unexplained'}`;
      })
      .sort(),
  };
}

describe('order of the lines', () => {
  // same_as refers to lines by index, so a session using it is not freely reorderable.
  const reorderable = DEMOS.filter((d) => !d.text.includes('same_as') && lineCount(d.text) > 1);

  it('does not change the explained species or any line’s assignment', () => {
    expect(reorderable.length).toBeGreaterThan(2);
    fc.assert(
      fc.property(
        fc.constantFrom(...reorderable).chain((demo) =>
          fc
            .shuffledSubarray(
              Array.from({ length: lineCount(demo.text) }, (_, i) => i),
              { minLength: lineCount(demo.text), maxLength: lineCount(demo.text) },
            )
            .map((order) => ({ demo, order })),
        ),
        ({ demo, order }) => {
          const base = assignmentsByWavelength(demo.name, demo.text);
          const shuffled = assignmentsByWavelength(demo.name, withLineOrder(demo.text, order));
          expect(shuffled).toEqual(base);
        },
      ),
      { seed: SEED, numRuns: 40 },
    );
  });
});
