import { describe, expect, it } from 'vitest';
import { gaussian, mulberry32, reduced, standardDeviation } from './helpers.js';

const RAD = Math.PI / 180;

describe('first-order σ against Monte-Carlo spreads (within 10 %)', () => {
  it('grating angle with incidence, second order, angle and spacing uncertainties', () => {
    const theta = 41.3;
    const sigmaTheta = 0.05;
    const alpha = 10;
    const lines = 600;
    const linesSigma = 4;
    const r = reduced(`lineledger: 1
medium: vacuum
measurement:
  method: grating-angle
  grating: { lines_per_mm: ${lines}, lines_per_mm_sigma: ${linesSigma} }
  order: 2
  incidence_deg: ${alpha}
  sigma: ${sigmaTheta}
lines:
  - angle_deg: ${theta}
`);
    const normal = gaussian(mulberry32(42));
    // Independent forward model: m·λ = d·(sin α + sin(θ − α)), d = 10⁶/N nm.
    const samples = Array.from({ length: 20000 }, () => {
      const d = 1e6 / (lines + linesSigma * normal());
      const t = theta + sigmaTheta * normal();
      return (d * (Math.sin(alpha * RAD) + Math.sin((t - alpha) * RAD))) / 2;
    });
    expect(Math.abs(r.lines[0]!.sigma_nm / standardDeviation(samples) - 1)).toBeLessThan(0.1);
  });

  it('same_as readings combine by inverse-variance weighting', () => {
    // Two readings of one line, first and second order, of different quality.
    const r = reduced(`lineledger: 1
medium: vacuum
measurement:
  method: grating-angle
  grating: { lines_per_mm: 300 }
lines:
  - angle_deg: 9.429
    sigma: 0.1
  - angle_deg: 19.126
    order: 2
    sigma: 0.05
    same_as: 0
`);
    expect(r.lines).toHaveLength(1);
    const d = 1e6 / 300;
    const s1 = 0.1;
    const s2 = 0.05;
    const normal = gaussian(mulberry32(99));
    // Independent: simulate both readings, form the weighted mean with weights from the
    // first-order σ of each (d·cos θ·σ_θ/m), and take the spread.
    const w1 = 1 / (d * Math.cos(9.429 * RAD) * s1 * RAD) ** 2;
    const w2 = 1 / ((d * Math.cos(19.126 * RAD) * s2 * RAD) / 2) ** 2;
    const samples = Array.from({ length: 20000 }, () => {
      const l1 = d * Math.sin((9.429 + s1 * normal()) * RAD);
      const l2 = (d * Math.sin((19.126 + s2 * normal()) * RAD)) / 2;
      return (w1 * l1 + w2 * l2) / (w1 + w2);
    });
    expect(Math.abs(r.lines[0]!.sigma_nm / standardDeviation(samples) - 1)).toBeLessThan(0.1);
    expect(r.lines[0]!.combined_indices).toEqual([1]);
  });
});
