import { describe, expect, it } from 'vitest';
import { findLines } from '../../src/reduce/profile/find.js';
import type { ProfileData } from '../../src/session/profile/types.js';
import { expectedCounts, poissonProfile } from '../helpers/profile.js';
import { gaussianDeviate, mulberry32 } from '../helpers/random.js';

const pixels = (n: number) => Array.from({ length: n }, (_, i) => i);
const profile = (y: number[], sigma: number[] | null = null): ProfileData => ({
  format: 'csv',
  axis: 'pixel',
  x: pixels(y.length),
  intensity: y,
  sigma,
  medium: null,
  description: '',
});
const emission = { kind: 'emission' as const, threshold_sigma: 5, add: [], drop: [] };

function monteCarlo(photons: number, sigma_px: number, background: number, runs: number) {
  const errors: number[] = [];
  const reported: number[] = [];
  let missed = 0;
  for (let seed = 1; seed <= runs; seed++) {
    const centre = 60 + (seed % 10) / 10;
    const y = poissonProfile(
      expectedCounts(128, [{ centre_px: centre, photons, sigma_px }], background),
      seed * 7919,
    );
    const near = findLines(profile(y), emission).lines.filter(
      (l) => Math.abs(l.centre - centre) < 3 * sigma_px,
    );
    if (near.length !== 1) {
      missed++;
      continue;
    }
    errors.push(near[0]!.centre - centre);
    reported.push(near[0]!.centre_sigma);
  }
  const rms = (v: number[]) => Math.sqrt(v.reduce((s, e) => s + e * e, 0) / v.length);
  return { missed, rms: rms(errors), reported: rms(reported) };
}

describe('centroids against the photon-noise limit', () => {
  // Thompson, Larson & Webb 2002, Biophys. J. 82:2775, eq. 17 (from memory): a least-squares
  // Gaussian fit to N photons with PSF σ on pixels of size a and background noise b has
  // ⟨Δx²⟩ = (σ² + a²/12)/N + 8π σ⁴ b²/(a² N²). Without background this is the σ/√N of the
  // mean of N photon positions, widened by the pixel's a²/12 (textbook).
  const limit = (n: number, s: number, b: number) =>
    Math.sqrt((s * s + 1 / 12) / n + (8 * Math.PI * s ** 4 * b * b) / (n * n));

  it('no background: 10 000 photons, σ = 1.5 px: scatter within 1.25× the limit, σ reported within 30 %', () => {
    const r = monteCarlo(10_000, 1.5, 0, 200);
    expect(r.missed).toBe(0);
    const bound = limit(10_000, 1.5, 0);
    expect(r.rms).toBeGreaterThan(0.8 * bound);
    expect(r.rms).toBeLessThan(1.25 * bound);
    expect(r.reported / r.rms).toBeGreaterThan(0.7);
    expect(r.reported / r.rms).toBeLessThan(1.3);
  });

  it('a background of 25 counts/px (b = 5): 20 000 photons, σ = 3 px', () => {
    const r = monteCarlo(20_000, 3, 25, 150);
    expect(r.missed).toBe(0);
    const bound = limit(20_000, 3, 5);
    expect(r.rms).toBeGreaterThan(0.8 * bound);
    expect(r.rms).toBeLessThan(1.25 * bound);
    expect(r.reported / r.rms).toBeGreaterThan(0.7);
    expect(r.reported / r.rms).toBeLessThan(1.3);
  });
});

describe('detection threshold', () => {
  it('pure Gaussian noise gives (almost) no lines at 5σ', () => {
    // P(z > 5) = 2.9e-7 for a normal variable (Abramowitz & Stegun, Table 26.1): across
    // 20 × 4096 points fewer than 0.1 chance exceedances are expected; allow one.
    let found = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const g = mulberry32(seed);
      const y = Array.from({ length: 4096 }, () => 1000 + 10 * gaussianDeviate(g));
      found += findLines(profile(y), emission).lines.length;
    }
    expect(found).toBeLessThanOrEqual(1);
  });

  it('the noise is estimated from the data: 10 counts of Gaussian noise reads as 10 ± 5 %', () => {
    const g = mulberry32(3);
    const y = Array.from({ length: 4096 }, () => 500 + 10 * gaussianDeviate(g));
    const f = findLines(profile(y), emission);
    expect(f.noise).toBeGreaterThan(9.5);
    expect(f.noise).toBeLessThan(10.5);
    expect(f.threshold).toBeCloseTo(5 * f.noise, 9);
  });
});

describe('blends, absorption, uncertainties, add and drop', () => {
  it('two equal lines one FWHM apart are split (beyond the 2σ Sparrow limit of two Gaussians, from memory)', () => {
    const s = 2;
    const d = 2.3548 * s;
    const y = poissonProfile(
      expectedCounts(
        200,
        [
          { centre_px: 100, photons: 20_000, sigma_px: s },
          { centre_px: 100 + d, photons: 20_000, sigma_px: s },
          { centre_px: 40, photons: 20_000, sigma_px: s },
        ],
        10,
      ),
      11,
    );
    const f = findLines(profile(y), emission);
    const pair = f.lines.filter((l) => l.centre > 90 && l.centre < 115);
    expect(pair.length).toBe(2);
    expect(Math.abs(pair[0]!.centre - 100)).toBeLessThan(5 * pair[0]!.centre_sigma + 0.05);
    expect(Math.abs(pair[1]!.centre - (100 + d))).toBeLessThan(5 * pair[1]!.centre_sigma + 0.05);
  });

  // Depth = 1 − F/F_continuum at the line centre (the usual definition, common practice).
  it('absorption dips on a sloping continuum: depths as a fraction of the continuum', () => {
    const g = mulberry32(5);
    const n = 1000;
    const depths = [0.3, 0.15, 0.5];
    const centres = [200.4, 500.2, 800.7];
    const y = pixels(n).map((i) => {
      const c = 1000 + 0.5 * i;
      let f = 1;
      centres.forEach((m, k) => {
        f -= depths[k]! * Math.exp(-0.5 * ((i - m) / 3) ** 2);
      });
      return c * f + 3 * gaussianDeviate(g);
    });
    const f = findLines(profile(y), { ...emission, kind: 'absorption' });
    expect(f.lines.map((l) => Math.round(l.centre))).toEqual([200, 500, 801]);
    f.lines.forEach((l, k) => {
      expect(Math.abs(l.amplitude - depths[k]!)).toBeLessThan(0.02);
      expect(Math.abs(l.centre - centres[k]!)).toBeLessThan(5 * l.centre_sigma);
      expect(l.fwhm).toBeGreaterThan(0.9 * 2.3548 * 3);
      expect(l.fwhm).toBeLessThan(1.1 * 2.3548 * 3);
    });
  });

  // With known point uncertainties the parameter covariance of a weighted least-squares fit is
  // (JᵀWJ)⁻¹ (Press et al., Numerical Recipes, 3rd ed., §15.4–15.5), so the reported σ must
  // match the Monte-Carlo scatter.
  it('given uncertainties are used as they are: reported σ matches the scatter', () => {
    const errors: number[] = [];
    const reported: number[] = [];
    for (let seed = 1; seed <= 100; seed++) {
      const g = mulberry32(seed);
      const sig = pixels(128).map((i) => 5 + i / 64);
      const y = pixels(128).map(
        (i) => 100 + 300 * Math.exp(-0.5 * ((i - 64.3) / 2) ** 2) + sig[i]! * gaussianDeviate(g),
      );
      const l = findLines(profile(y, sig), emission).lines.find((x) => Math.abs(x.centre - 64.3) < 3)!;
      errors.push(l.centre - 64.3);
      reported.push(l.centre_sigma);
    }
    const rms = Math.sqrt(errors.reduce((s, e) => s + e * e, 0) / errors.length);
    const mean = reported.reduce((s, e) => s + e, 0) / reported.length;
    expect(mean / rms).toBeGreaterThan(0.8);
    expect(mean / rms).toBeLessThan(1.25);
  });

  it('profile.drop removes the nearest found line; profile.add fits one below the threshold', () => {
    const exp = expectedCounts(
      300,
      [
        { centre_px: 100, photons: 5000, sigma_px: 2 },
        { centre_px: 200, photons: 5000, sigma_px: 2 },
        { centre_px: 250, photons: 60, sigma_px: 2 },
      ],
      20,
    );
    const y = poissonProfile(exp, 4);
    y[150] = (y[150] ?? 0) + 400; // a one-pixel spike
    const plain = findLines(profile(y), emission);
    expect(plain.lines.some((l) => Math.abs(l.centre - 150) < 1)).toBe(true);
    expect(plain.lines.some((l) => Math.abs(l.centre - 250) < 3)).toBe(false);
    const edited = findLines(profile(y), { ...emission, add: [250], drop: [150.5, 20] });
    expect(edited.lines.some((l) => Math.abs(l.centre - 150) < 1)).toBe(false);
    expect(edited.dropped.length).toBe(1);
    expect(edited.unmatched_drops).toEqual([20]);
    const added = edited.lines.find((l) => l.origin === 'added');
    expect(added && Math.abs(added.centre - 250)).toBeLessThan(1.5);
  });
});
