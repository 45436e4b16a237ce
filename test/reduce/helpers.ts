/** Builders shared by the reduce tests: a YAML session text → Session → Reduction. */
import { expect } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics.js';
import { reduceSession } from '../../src/reduce/reduce.js';
import type { Reduction } from '../../src/reduce/types.js';
import { readSessionText } from '../../src/session/read.js';
import type { Session } from '../../src/session/types.js';

export function sessionOf(yaml: string): Session {
  const read = readSessionText(yaml, 'test.yaml');
  if (!read.ok) throw new Error(`test session does not read: ${JSON.stringify(read.diagnostics)}`);
  return read.value;
}

export function reduced(yaml: string): Reduction {
  const out = reduceSession(sessionOf(yaml));
  if (!out.ok) throw new Error(`test session does not reduce: ${JSON.stringify(out.diagnostics)}`);
  return out.value;
}

/** The diagnostics of a session that must fail, whether at reading or at reduction. */
export function failures(yaml: string): Diagnostic[] {
  const read = readSessionText(yaml, 'test.yaml');
  if (!read.ok) return read.diagnostics;
  const out = reduceSession(read.value);
  if (out.ok) throw new Error('expected this session to fail');
  return out.diagnostics;
}

/** The diagnostics of a hand-altered Session that must fail at reduction. */
export function reduceFailures(session: Session): Diagnostic[] {
  const out = reduceSession(session);
  if (out.ok) throw new Error('expected this session to fail');
  return out.diagnostics;
}

/** An error diagnostic with this code exists and points at a real place in test.yaml. */
export function expectPositioned(diagnostics: Diagnostic[], code: string, field?: string): Diagnostic {
  const found = diagnostics.find(
    (d) => d.code === code && d.severity === 'error' && (field === undefined || d.field === field),
  );
  expect(
    found,
    `no ${code} error${field ? ` on ${field}` : ''} in ${JSON.stringify(diagnostics)}`,
  ).toBeDefined();
  const d = found as Diagnostic;
  expect(d.file).toBe('test.yaml');
  expect(d.line).toBeGreaterThanOrEqual(1);
  expect(d.col).toBeGreaterThanOrEqual(1);
  expect(d.message.length).toBeGreaterThan(0);
  return d;
}

/** Seeded PRNG (mulberry32) so the Monte-Carlo checks are reproducible. */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviates by the Box–Muller transform. */
export function gaussian(uniform: () => number): () => number {
  return () => {
    const u = 1 - uniform(); // (0, 1]: log(0) would be −∞
    const v = uniform();
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  };
}

export function standardDeviation(values: readonly number[]): number {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
}
