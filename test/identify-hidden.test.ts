// A line hidden under another species' matched line costs no completeness (explain.ts): two
// lines closer than one FWHM are one feature on the instrument. Checked against the model's own
// terms: the set total of A+B with B's line under A's must differ from the same set with B's
// line far away by exactly B's weighed miss cost (model.ts: log(1 − q) per unseen line).
import { describe, expect, it } from 'vitest';
import type { EvidenceContext } from '../src/identify/evidence.js';
import { lineMissCost } from '../src/identify/evidence.js';
import { scoreSet } from '../src/identify/explain.js';
import { Q_STRONG } from '../src/identify/model.js';
import type { PreparedSpecies, RefLine } from '../src/identify/types.js';

const ctx: EvidenceContext = {
  points: [
    { vacuum_nm: 500, sigma_nm: 0.2 },
    { vacuum_nm: 600, sigma_nm: 0.2 },
  ],
  intensities: [null, null],
  range_nm: [400, 700],
  fwhm_nm: 1,
  background_per_nm: 2 / 300,
  medianSigma_nm: 0.2,
  missWeight: 1,
  strongMissWeight: 1,
  flatIntensities: true,
};

const ref = (species: string, vacuum_nm: number): RefLine => ({
  species,
  vacuum_nm,
  unc_nm: 0,
  intensity: 100,
  flags: [],
  members: 1,
});

function prepared(species: string, refs: RefLine[]): PreparedSpecies {
  const q = Float64Array.from(refs, () => Q_STRONG);
  const missCost = refs.reduce((a) => a + lineMissCost(Q_STRONG, 1, 1), 0);
  return { species, refs, touched: refs.map((_, k) => k), q, missCost, threshold: 0, flat: true };
}

describe('hidden lines', () => {
  it('give back the miss cost of a line within one FWHM of another species matched line', () => {
    const a = prepared('A', [ref('A', 500)]);
    // B: one line of its own at 600 nm, one at 500.4 nm (under A's) or at 650 nm (nowhere).
    const hiddenB = prepared('B', [ref('B', 500.4), ref('B', 600)]);
    const missingB = prepared('B', [ref('B', 600), ref('B', 650)]);
    const none = () => 0;
    const withHidden = scoreSet(
      ['A', 'B'],
      new Map([
        ['A', a],
        ['B', hiddenB],
      ]),
      ctx,
      none,
    );
    const withMissing = scoreSet(
      ['A', 'B'],
      new Map([
        ['A', a],
        ['B', missingB],
      ]),
      ctx,
      none,
    );
    expect(withHidden.matches.map((m) => m.ref.vacuum_nm)).toEqual([500, 600]);
    expect(withMissing.matches.map((m) => m.ref.vacuum_nm)).toEqual([500, 600]);
    expect(withHidden.total - withMissing.total).toBeCloseTo(-lineMissCost(Q_STRONG, 1, 1), 12);
  });

  it('do not give it back for a line of the same species, or one more than one FWHM away', () => {
    const none = () => 0;
    const a = prepared('A', [ref('A', 500), ref('A', 500.4)]);
    const far = prepared('B', [ref('B', 501.2), ref('B', 600)]);
    const missingB = prepared('B', [ref('B', 600), ref('B', 650)]);
    const single = scoreSet(['A'], new Map([['A', a]]), ctx, none);
    // A's own unmatched 500.4 nm line still costs: the same total as its plain terms give.
    expect(single.matches).toHaveLength(1);
    const farSet = scoreSet(
      ['A', 'B'],
      new Map([
        ['A', prepared('A', [ref('A', 500)])],
        ['B', far],
      ]),
      ctx,
      none,
    );
    const missSet = scoreSet(
      ['A', 'B'],
      new Map([
        ['A', prepared('A', [ref('A', 500)])],
        ['B', missingB],
      ]),
      ctx,
      none,
    );
    expect(farSet.total).toBeCloseTo(missSet.total, 12);
    expect(single.total).toBeLessThan(
      scoreSet(['A'], new Map([['A', prepared('A', [ref('A', 500)])]]), ctx, none).total,
    );
  });
});
