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

export { gaussian, mulberry32 } from '../helpers/random.js';

export function standardDeviation(values: readonly number[]): number {
  const mean = values.reduce((a, b) => a + b, 0) / values.length;
  return Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1));
}
