/**
 * Weighted least-squares polynomial y(x) = Σ cᵢ (x − x₀)ⁱ with the coefficient covariance.
 * The abscissa is centred on x₀ (the mean of the points) and scaled to [−1, 1] while solving,
 * so the normal equations stay well conditioned for pixel values in the thousands; the result
 * is handed back in unscaled (x − x₀)ⁱ form.
 */
import { invert, type Matrix, multiplyVector, quadraticForm, zeros } from './matrix.js';

export interface PolynomialFit {
  /** c₀…c_k for powers of (x − origin). */
  coefficients: number[];
  origin: number;
  /** Covariance of the coefficients, already multiplied by `covariance_scale`. */
  covariance: Matrix;
  chi2: number;
  dof: number;
  /** χ²/dof when that exceeds 1 (and dof > 0), else 1: the factor applied to the covariance. */
  covariance_scale: number;
}

/** g = (1, u, u², …, u^k), u = x − origin: the gradient of y with respect to the coefficients. */
export function basis(x: number, origin: number, degree: number): number[] {
  const u = x - origin;
  return Array.from({ length: degree + 1 }, (_, i) => u ** i);
}

export function evaluatePolynomial(coefficients: readonly number[], origin: number, x: number): number {
  const u = x - origin;
  // Horner's rule.
  let y = 0;
  for (let i = coefficients.length - 1; i >= 0; i--) y = y * u + coefficients[i]!;
  return y;
}

export function derivativeCoefficients(coefficients: readonly number[]): number[] {
  return coefficients.slice(1).map((c, i) => c * (i + 1));
}

export function evaluateDerivative(coefficients: readonly number[], origin: number, x: number): number {
  return evaluatePolynomial(derivativeCoefficients(coefficients), origin, x);
}

/** Variance of the fitted value at x from the coefficient covariance alone: gᵀ C g. */
export function fittedVariance(fit: PolynomialFit, x: number): number {
  return quadraticForm(fit.covariance, basis(x, fit.origin, fit.coefficients.length - 1));
}

/**
 * Fit with weights 1/σᵢ². Returns null when the points cannot determine the coefficients
 * (fewer points than coefficients, or all at one abscissa).
 */
export function fitPolynomial(
  x: readonly number[],
  y: readonly number[],
  sigma: readonly number[],
  degree: number,
): PolynomialFit | null {
  const n = x.length;
  const k = degree + 1;
  if (n < k || y.length !== n || sigma.length !== n) return null;
  const origin = x.reduce((a, b) => a + b, 0) / n;
  const halfRange = Math.max(...x.map((v) => Math.abs(v - origin)));
  if (!(halfRange > 0)) return null;

  const normal = zeros(k, k);
  const rhs = new Array<number>(k).fill(0);
  for (let i = 0; i < n; i++) {
    const w = 1 / sigma[i]! ** 2;
    const g = basis((x[i]! - origin) / halfRange, 0, degree);
    for (let a = 0; a < k; a++) {
      rhs[a] = rhs[a]! + w * g[a]! * y[i]!;
      for (let b = 0; b < k; b++) normal[a]![b] = normal[a]![b]! + w * g[a]! * g[b]!;
    }
  }
  const inverse = invert(normal);
  if (!inverse) return null;
  const scaled = multiplyVector(inverse, rhs);
  // Undo the scaling u = (x − x₀)/h: cᵢ = aᵢ / hⁱ and Cᵢⱼ = Aᵢⱼ / hⁱ⁺ʲ.
  const coefficients = scaled.map((a, i) => a / halfRange ** i);
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const r = y[i]! - evaluatePolynomial(coefficients, origin, x[i]!);
    chi2 += (r / sigma[i]!) ** 2;
  }
  const dof = n - k;
  const covariance_scale = dof > 0 && chi2 / dof > 1 ? chi2 / dof : 1;
  const covariance = inverse.map((row, i) =>
    row.map((c, j) => (c * covariance_scale) / halfRange ** (i + j)),
  );
  return { coefficients, origin, covariance, chi2, dof, covariance_scale };
}
