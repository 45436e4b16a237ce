/**
 * Synthetic camera profiles for the tests and the bench: Gaussian lines integrated over each
 * pixel on a flat background, with Poisson noise (counts as photons).
 */
import { mulberry32, poissonDeviate } from './random.js';

/** erf by Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7). */
export function erf(x: number): number {
  const s = Math.sign(x);
  const t = 1 / (1 + 0.327_591_1 * Math.abs(x));
  const y =
    1 -
    ((((1.061_405_429 * t - 1.453_152_027) * t + 1.421_413_741) * t - 0.284_496_736) * t + 0.254_829_592) *
      t *
      Math.exp(-x * x);
  return s * y;
}

export interface SyntheticLine {
  centre_px: number;
  /** Photons in the whole line. */
  photons: number;
  sigma_px: number;
}

/** Expected counts per pixel (pixel i spans i − ½ … i + ½). */
export function expectedCounts(n: number, lines: readonly SyntheticLine[], background: number): number[] {
  const out = new Array<number>(n).fill(background);
  for (const l of lines) {
    const from = Math.max(0, Math.floor(l.centre_px - 8 * l.sigma_px));
    const to = Math.min(n - 1, Math.ceil(l.centre_px + 8 * l.sigma_px));
    const k = 1 / (Math.SQRT2 * l.sigma_px);
    for (let i = from; i <= to; i++)
      out[i]! += (l.photons * (erf((i + 0.5 - l.centre_px) * k) - erf((i - 0.5 - l.centre_px) * k))) / 2;
  }
  return out;
}

export function poissonProfile(expected: readonly number[], seed: number): number[] {
  const u = mulberry32(seed);
  return expected.map((m) => poissonDeviate(u, m));
}
