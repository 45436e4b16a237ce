/**
 * The real-observation cases are well-formed: each reads as a lineledger session without errors,
 * has one expected entry per line, a citation, and the half the split rule gives
 * (test/real/README.md). Accuracy is the benchmark's business (npm run bench:real), not this test's.
 */
import { describe, expect, it } from 'vitest';
import { readSessionText } from '../../src/session/read.js';
import { acceptable, halfFor, loadCases, normalizeSpecies, parseCase } from './cases.js';

const { cases, problems } = loadCases();

describe('real-observation case files', () => {
  it('all parse', () => {
    expect(problems).toEqual([]);
    // Issue 10 asks for at least 40 published line lists.
    expect(cases.length).toBeGreaterThanOrEqual(40);
  });

  it.each(cases.map((c) => [c.file, c] as const))('%s is well-formed', (file, c) => {
    expect(`${c.case}.yaml`).toBe(file);
    expect(c.half).toBe(halfFor(c.case));
    expect(c.citation.length).toBeGreaterThan(20);
    expect(c.expected.length).toBe(c.lineCount);
    const read = readSessionText(c.sessionText, file);
    expect(read.ok ? [] : read.diagnostics.map((d) => `${d.field}: ${d.message}`)).toEqual([]);
  });
});

describe('split rule and notation', () => {
  it('halves follow the first byte of sha256', () => {
    // sha256("abc") = ba7816bf… (FIPS 180-2, Appendix B.1): 0xba is even → dev.
    expect(halfFor('abc')).toBe('dev');
    // sha256("") = e3b0c442… (FIPS 180-4 test vector of the empty message): 0xe3 is odd → heldout.
    expect(halfFor('')).toBe('heldout');
  });

  it('brackets of forbidden and semi-forbidden lines are dropped', () => {
    expect(normalizeSpecies('[O III]')).toBe('O III');
    expect(normalizeSpecies('C III]')).toBe('C III');
    expect(acceptable(['[Fe II]', 'Fe I'])).toEqual(['Fe II', 'Fe I']);
    expect(acceptable(null)).toEqual([]);
  });

  it('a malformed case is reported, not thrown', () => {
    const r = parseCase('x.yaml', 'case: x\nhalf: maybe\n');
    expect(r.value).toBeNull();
    expect(r.problems.map((p) => p.message)).toContain('half must be dev or heldout, not maybe');
  });
});
