/**
 * The matching of measured to reference lines against an exhaustive search: every one-to-one
 * assignment of a few lines to a few references (each pair either taken or not) is tried, and
 * the dynamic programme and its forced-pair variant must find the same maximum. The likelihood
 * itself is model.ts's; this checks only that the optimisation is exact.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { bestMatching, type MatchInput, matchingWith } from '../src/identify/match.js';
import { matchGain, pairSigma, WINDOW_SIGMAS } from '../src/identify/model.js';
import type { RefLine } from '../src/identify/types.js';

const ref = (species: string, vacuum_nm: number): RefLine => ({
  species,
  vacuum_nm,
  unc_nm: 0.01,
  intensity: 1,
  flags: [],
  members: 1,
});

/** The best total gain over all one-to-one partial matchings, pairs held as `forced` required. */
function exhaustive(input: MatchInput, forced: readonly { line: number; ref: number }[] = []): number {
  const gain = (i: number, k: number) => {
    const line = input.lines[i] as { vacuum_nm: number; sigma_nm: number };
    const r = input.refs[k] as RefLine;
    const sigma = pairSigma(line.sigma_nm, r.unc_nm, input.fwhm_nm);
    const delta = line.vacuum_nm - r.vacuum_nm;
    if (Math.abs(delta) > WINDOW_SIGMAS * sigma) return Number.NEGATIVE_INFINITY;
    return matchGain(delta, sigma, input.q[k] as number, input.background_per_nm);
  };
  let best = Number.NEGATIVE_INFINITY;
  const usedRefs = new Set<number>();
  const pick = (i: number, total: number, held: Map<number, number>) => {
    if (i === input.lines.length) {
      if (forced.every((p) => held.get(p.line) === p.ref)) best = Math.max(best, total);
      return;
    }
    pick(i + 1, total, held);
    for (const k of input.cols) {
      const g = gain(i, k);
      if (usedRefs.has(k) || !(g > 0)) continue;
      usedRefs.add(k);
      held.set(i, k);
      pick(i + 1, total + g, held);
      held.delete(i);
      usedRefs.delete(k);
    }
  };
  pick(0, 0, new Map());
  return best;
}

const inputOf = (lines: number[], refs: RefLine[], q: number[]): MatchInput => ({
  lines: [...lines].sort((a, b) => a - b).map((vacuum_nm) => ({ vacuum_nm, sigma_nm: 0.6 })),
  refs: [...refs].sort((a, b) => a.vacuum_nm - b.vacuum_nm),
  cols: refs.map((_, k) => k),
  q: Float64Array.from(q),
  fwhm_nm: 1,
  background_per_nm: 0.02,
});

describe('line matching', () => {
  it('the dynamic programme finds the best one-to-one matching (exhaustive search)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 500, max: 510, noNaN: true }), { minLength: 1, maxLength: 5 }),
        fc.array(fc.double({ min: 500, max: 510, noNaN: true }), { minLength: 1, maxLength: 5 }),
        (lines, centres) => {
          const input = inputOf(
            lines,
            centres.map((c) => ref('X', c)),
            centres.map((_, k) => (k % 2 ? 0.9 : 0.12)),
          );
          const { gain } = bestMatching(input);
          expect(gain).toBeCloseTo(Math.max(0, exhaustive(input)), 9);
        },
      ),
      { seed: 20261204, numRuns: 300 },
    );
  });

  it('a forced pair gives the best matching that holds it, or null outside its window', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 500, max: 506, noNaN: true }), { minLength: 1, maxLength: 5 }),
        fc.array(fc.double({ min: 500, max: 506, noNaN: true }), { minLength: 1, maxLength: 5 }),
        fc.nat(),
        fc.nat(),
        (lines, centres, a, b) => {
          const input = inputOf(
            lines,
            centres.map((c, k) => ref(k % 2 ? 'A' : 'B', c)),
            centres.map(() => 0.9),
          );
          const pair = { line: a % input.lines.length, ref: b % input.refs.length };
          const forced = matchingWith(input, [pair]);
          const expected = exhaustive(input, [pair]);
          if (expected === Number.NEGATIVE_INFINITY) expect(forced).toBeNull();
          else {
            expect(forced?.gain).toBeCloseTo(expected, 9);
            expect(forced?.matches.some((m) => m.line === pair.line && m.ref === input.refs[pair.ref])).toBe(
              true,
            );
            // Each measured line and each reference used at most once, lines in order.
            const lineIds = forced?.matches.map((m) => m.line) ?? [];
            expect(lineIds).toEqual([...new Set(lineIds)].sort((x, y) => x - y));
            expect(new Set(forced?.matches.map((m) => m.ref)).size).toBe(lineIds.length);
          }
        },
      ),
      { seed: 20261204, numRuns: 300 },
    );
  });
});
