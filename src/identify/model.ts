/**
 * The likelihood model behind every score (docs/identification.md writes it out).
 *
 * Measured lines are a point process on the range [a, b] of length L. Under the null,
 * all n lines are background, density β = n / L per nm. Under "species S is present",
 * each reference line k of S in range is detected with probability q_k at a Gaussian
 * position around its wavelength (σ_ik² = σ_i² + u_k² + (FWHM / (2·2.3548))², the last term
 * a centroiding floor for the instrument's resolution — common practice); undetected lines
 * cost log(1 − q_k). A one-to-one matching of measured to reference lines then gives
 *
 *   LLR(S) = Σ_unmatched k log(1 − q_k) + Σ_matched (i,k) [ log q_k + log N(Δ_ik; σ_ik) − log β ]
 *
 * so a dense species pays for all the lines it predicts but that are not there, and
 * gains only log(q/(βσ√2π)) per match: numbers alone do not win.
 */
import { FWHM_PER_SIGMA } from '../constants.js';
import type { IdentificationStatus } from './types.js';

/** Detection probability of a reference line above the session's detection limit. */
export const Q_STRONG = 0.9;
/** …and below it (weak lines are sometimes seen, often not). */
export const Q_WEAK = 0.12;
/** Matches are allowed within this many σ. */
export const WINDOW_SIGMAS = 3.5;
/** Weight of the intensity-rank agreement term (nats per unit of ρ·(m − 1)/2). */
export const RANK_WEIGHT = 1;

export function pairSigma(lineSigma_nm: number, refUnc_nm: number, fwhm_nm: number): number {
  const centroid = fwhm_nm / (2 * FWHM_PER_SIGMA);
  return Math.sqrt(lineSigma_nm * lineSigma_nm + refUnc_nm * refUnc_nm + centroid * centroid);
}

const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** Gain of matching a line at distance Δ from a reference line detected with probability q. */
export function matchGain(delta_nm: number, sigma_nm: number, q: number, background_per_nm: number): number {
  const z = delta_nm / sigma_nm;
  const logDensity = -0.5 * z * z - Math.log(sigma_nm) - LOG_SQRT_2PI;
  return Math.log(q) - Math.log1p(-q) + logDensity - Math.log(background_per_nm);
}

/**
 * Platt scaling of the explanation's posterior share: p = σ(slope · logit(raw) + intercept).
 * The posterior over the explanations visited is right in rank but not in scale (the Occam
 * penalty is a prior we chose); these two numbers map it onto observed accuracy. Fitted by
 * scripts/fit-confidence.ts on 3000 synthetic sessions (`npm run bench:identify -- --n 500
 * --seed 1`) and the cases of the real benchmark's development half together, each set
 * weighing as much as the other (2026-12-02: 1.28 / 0.26; refitted 2026-12-03 after hidden
 * lines stopped costing a mixture its completeness, explain.ts, 1.19 / 0.42; refitted
 * 2026-12-04 on the 28 development cases after the line scatter of quasars, 0.76 / 0.78; refitted
again the same day on 57 development cases after forced favoured species, blend spans and swaps,
0.71 / 0.63 (Brier score on the development half 0.134 → 0.132); before 2026-12-02:
 * 1.29 / 2.24 from synthetic sessions alone, which made real explanations look surer than they
 * were: 93 % stated, 83 % right).
 */
export const CONFIDENCE_CALIBRATION = { slope: 0.71, intercept: 0.63 };

export function calibratedConfidence(raw: number, calibration = CONFIDENCE_CALIBRATION): number {
  const p = Math.min(1 - 1e-9, Math.max(1e-9, raw));
  const x = calibration.slope * Math.log(p / (1 - p)) + calibration.intercept;
  return 1 / (1 + Math.exp(-x));
}

/**
 * Cost of a line predicted but not listed, as a fraction of its full log(1 − q): a selection
 * (published and club lists name the lines they care about) and a source whose catalog
 * intensities do not hold (flames, stars, the sky) say little by leaving a line out. Chosen on
 * the development half of the real-observation benchmark.
 */
export const SELECTION_MISS_WEIGHT = 0.15;
export const DISTRUST_MISS_WEIGHT = 0.35;

export function missWeight(listed: 'all-seen' | 'selection', distrusted: boolean): number {
  return (listed === 'selection' ? SELECTION_MISS_WEIGHT : 1) * (distrusted ? DISTRUST_MISS_WEIGHT : 1);
}

/**
 * Cost weight of a missing line at or above the species' profiled detection limit. A selection
 * leaves out lines, but an observer who lists a species' line lists its stronger lines too
 * (nobody names [N II] 654.8 and omits 658.4, three times brighter): where the catalog's
 * intensities hold, the selection discount covers only the lines weaker than that limit.
 * Where they do not hold, "stronger" means nothing and the discount covers every line.
 */
export function strongMissWeight(listed: 'all-seen' | 'selection', distrusted: boolean): number {
  return distrusted ? missWeight(listed, distrusted) : 1;
}

/** A leftover line's best assignment this probable or better is shown as tentative. */
export const TENTATIVE_MIN = 0.3;

/** An explanation this probable or better is reported as identified; below, as ambiguous. */
export const IDENTIFIED_THRESHOLD = 0.7;

export function statusFor(species: readonly string[], confidence: number): IdentificationStatus {
  if (species.length === 0) return 'unexplained';
  return confidence >= IDENTIFIED_THRESHOLD ? 'identified' : 'ambiguous';
}
