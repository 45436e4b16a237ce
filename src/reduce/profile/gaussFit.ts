/**
 * Weighted least-squares fit of a sum of Gaussians on a constant, by Levenberg–Marquardt
 * (Press et al., Numerical Recipes, 3rd ed., §15.5) with the analytic Jacobian, returning the
 * covariance (JᵀWJ)⁻¹ that line positions take their σ from.
 *
 * ml-levenberg-marquardt 5.1.0 was tried first and not kept: it returns no covariance, and its
 * step weights residuals by 1/w² while its error sum weights them by w², so a fit with unequal
 * point uncertainties (Poisson noise) is steered and judged by different sums. The method is
 * a few dozen lines with the matrix helpers the calibration fit already uses.
 */
import { invert, type Matrix } from '../fit/matrix.js';

export interface GaussComponent {
  amplitude: number;
  centre: number;
  /** Gaussian σ (not the FWHM), in x units. */
  width: number;
}

export interface GaussFitInput {
  x: readonly number[];
  y: readonly number[];
  /** 1/variance of each point. */
  weight: readonly number[];
  start: { offset: number; components: GaussComponent[] };
  /** Bounds of each component's centre and width. */
  centreRange: [number, number];
  widthRange: [number, number];
  /**
   * Width of the bin each point integrates (a pixel), in x units: the model is then the
   * Gaussian integrated over each bin, which a narrow line needs (a sampled Gaussian misplaces
   * it by a phase-dependent amount). 0 samples the Gaussian at each x.
   */
  binWidth?: number;
}

export interface GaussFit {
  offset: number;
  components: GaussComponent[];
  /** Parameter order: offset, then amplitude, centre, width per component. */
  covariance: Matrix;
  chi2: number;
  dof: number;
  /** The model at each x. */
  model: number[];
  /**
   * Leverage of each point, hᵢ = wᵢ Jᵢ C Jᵢᵀ: the share of its own residual the fit absorbs,
   * so rᵢ²/(1 − hᵢ) estimates its noise variance without the fit's shrinkage (common practice).
   */
  leverage: number[];
}

function unpack(p: readonly number[]): { offset: number; components: GaussComponent[] } {
  const components: GaussComponent[] = [];
  for (let k = 1; k + 2 < p.length; k += 3)
    components.push({ amplitude: p[k]!, centre: p[k + 1]!, width: p[k + 2]! });
  return { offset: p[0]!, components };
}

/** erf by Abramowitz & Stegun 7.1.26 (|error| < 1.5 × 10⁻⁷). */
function erf(v: number): number {
  const t = 1 / (1 + 0.327_591_1 * Math.abs(v));
  const y =
    1 -
    ((((1.061_405_429 * t - 1.453_152_027) * t + 1.421_413_741) * t - 0.284_496_736) * t + 0.254_829_592) *
      t *
      Math.exp(-v * v);
  return v < 0 ? -y : y;
}

const SQRT_HALF_PI = Math.sqrt(Math.PI / 2);
const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);

/**
 * A Gaussian of peak a integrated over [x − Δ/2, x + Δ/2] and divided by Δ:
 * a·√(π/2)·(s/Δ)·(erf u₊ − erf u₋), u± = (x ± Δ/2 − μ)/(s√2), with its derivatives.
 */
function binned(p: readonly number[], x: number, delta: number, grad: number[] | null): number {
  let f = p[0]!;
  if (grad) grad[0] = 1;
  for (let k = 1; k < p.length; k += 3) {
    const a = p[k]!;
    const mu = p[k + 1]!;
    const s = p[k + 2]!;
    const up = (x + delta / 2 - mu) / (Math.SQRT2 * s);
    const um = (x - delta / 2 - mu) / (Math.SQRT2 * s);
    const diff = erf(up) - erf(um);
    const ep = Math.exp(-up * up);
    const em = Math.exp(-um * um);
    const g = (SQRT_HALF_PI * s * diff) / delta;
    f += a * g;
    if (grad) {
      grad[k] = g;
      grad[k + 1] = (-a * (ep - em)) / delta;
      grad[k + 2] = ((a * SQRT_HALF_PI) / delta) * (diff - TWO_OVER_SQRT_PI * (up * ep - um * em));
    }
  }
  return f;
}

function evaluate(p: readonly number[], x: number, grad: number[] | null, delta = 0): number {
  if (delta > 0) return binned(p, x, delta, grad);
  let f = p[0]!;
  if (grad) grad[0] = 1;
  for (let k = 1; k < p.length; k += 3) {
    const a = p[k]!;
    const mu = p[k + 1]!;
    const s = p[k + 2]!;
    const u = (x - mu) / s;
    const e = Math.exp(-0.5 * u * u);
    f += a * e;
    if (grad) {
      grad[k] = e;
      grad[k + 1] = (a * e * u) / s;
      grad[k + 2] = (a * e * u * u) / s;
    }
  }
  return f;
}

function chi2Of(input: GaussFitInput, p: readonly number[]): number {
  let c = 0;
  for (let i = 0; i < input.x.length; i++) {
    const r = input.y[i]! - evaluate(p, input.x[i]!, null, input.binWidth);
    c += input.weight[i]! * r * r;
  }
  return c;
}

/** Normal equations JᵀWJ and JᵀWr at p. */
function normal(input: GaussFitInput, p: readonly number[]): { h: Matrix; g: number[] } {
  const n = p.length;
  const h: Matrix = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const g = new Array<number>(n).fill(0);
  const grad = new Array<number>(n).fill(0);
  for (let i = 0; i < input.x.length; i++) {
    const r = input.y[i]! - evaluate(p, input.x[i]!, grad, input.binWidth);
    const w = input.weight[i]!;
    for (let a = 0; a < n; a++) {
      const wa = w * grad[a]!;
      g[a]! += wa * r;
      const row = h[a]!;
      for (let b = 0; b <= a; b++) row[b]! += wa * grad[b]!;
    }
  }
  for (let a = 0; a < n; a++) for (let b = 0; b < a; b++) h[b]![a] = h[a]![b]!;
  return { h, g };
}

function clamp(p: number[], input: GaussFitInput): void {
  const [c0, c1] = input.centreRange;
  const [w0, w1] = input.widthRange;
  for (let k = 1; k < p.length; k += 3) {
    p[k + 1] = Math.min(Math.max(p[k + 1]!, c0), c1);
    p[k + 2] = Math.min(Math.max(p[k + 2]!, w0), w1);
  }
}

export function fitGaussians(input: GaussFitInput, maxIterations = 200): GaussFit | null {
  let p = [input.start.offset, ...input.start.components.flatMap((c) => [c.amplitude, c.centre, c.width])];
  clamp(p, input);
  let chi2 = chi2Of(input, p);
  let lambda = 1e-3;
  for (let it = 0; it < maxIterations; it++) {
    const { h, g } = normal(input, p);
    // Marquardt's scaling: damp each parameter by its own curvature (NR §15.5.2).
    const damped = h.map((row, a) => row.map((v, b) => (a === b ? v * (1 + lambda) : v)));
    const inv = invert(damped);
    if (!inv) {
      lambda *= 10;
      if (lambda > 1e12) break;
      continue;
    }
    const step = inv.map((row) => row.reduce((s, v, b) => s + v * g[b]!, 0));
    const trial = p.map((v, a) => v + step[a]!);
    clamp(trial, input);
    const c = chi2Of(input, trial);
    if (Number.isFinite(c) && c <= chi2) {
      // The weights make χ² dimensionless: a change below 10⁻³ moves no parameter by a
      // meaningful fraction of its σ (Δχ² = 1 is one σ).
      const done = chi2 - c <= Math.max(1e-3, 1e-12 * chi2);
      p = trial;
      chi2 = c;
      lambda = Math.max(lambda / 10, 1e-12);
      if (done) break;
    } else {
      lambda *= 10;
      if (lambda > 1e12) break;
    }
  }
  const { h } = normal(input, p);
  const covariance = invert(h);
  if (!covariance) return null;
  const { offset, components } = unpack(p);
  const grad = new Array<number>(p.length).fill(0);
  const leverage = input.x.map((x, i) => {
    evaluate(p, x, grad, input.binWidth);
    let h = 0;
    for (let a = 0; a < p.length; a++) {
      let row = 0;
      for (let b = 0; b < p.length; b++) row += covariance[a]![b]! * grad[b]!;
      h += grad[a]! * row;
    }
    return Math.min(0.95, input.weight[i]! * h);
  });
  return {
    leverage,
    offset,
    components,
    covariance,
    chi2,
    dof: input.x.length - p.length,
    model: input.x.map((x) => evaluate(p, x, null, input.binWidth)),
  };
}
