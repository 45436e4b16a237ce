/**
 * Reading offset and scale error of an instrument not calibrated in the session.
 *
 * Hand spectroscopes and phone gratings often read a constant amount long or short, or with a
 * slightly wrong scale. After a first identification, the residuals of the identified lines
 * (λ_read − λ_ref) are fitted by weighted least squares as a = offset, plus with four or more
 * lines a linear term b · (λ − pivot). The offset has a Gaussian prior of width one resolution
 * element (a reading error larger than that would have been noticed by eye; common practice),
 * so a few lines cannot pull it far. It is applied only when it is significant (|a| ≥ 2.5 σ_a)
 * and the re-identified lines explain the session at least as well.
 */

import type { MeasuredLine, Reduction } from '../reduce/types.js';
import { toFaintLine } from './faint.js';
import type { Identification, ScaleCorrection } from './types.js';

/** How many standard errors make an offset or scale worth applying (common practice). */
const SIGNIFICANCE = 2.5;

interface Point {
  x_nm: number;
  r_nm: number;
  w: number;
}

/**
 * The identified lines' residuals against their reference lines, with weights 1/σ². The
 * readings come from `reduction` (the uncorrected one), so that a fit repeated on a later
 * identification gives the whole correction, not a remainder.
 */
function residualPoints(reduction: Reduction, idn: Identification): { points: Point[]; species: string[] } {
  const byIndex = new Map<number, MeasuredLine>(reduction.lines.map((l) => [l.index, l]));
  const points: Point[] = [];
  const species = new Set<string>();
  for (const line of idn.lines) {
    const a = line.assignment;
    const measured = byIndex.get(line.index);
    // A blend's centre depends on its members' strengths at this resolution: not a fixed point.
    if (line.status !== 'identified' || !a || a.blend || toFaintLine(a) || !measured) continue;
    const sigma = Math.max(measured.rest_sigma_nm, 0.005);
    points.push({
      x_nm: measured.rest_vacuum_nm,
      r_nm: measured.rest_vacuum_nm - a.ref_vacuum_nm,
      w: 1 / (sigma * sigma),
    });
    species.add(a.species);
  }
  return { points, species: [...species].sort() };
}

/**
 * The fitted correction, or null when the lines show none worth applying. `prior_nm` is the
 * width of the offset's prior (the resolution FWHM).
 */
export function fitReadingOffset(
  reduction: Reduction,
  idn: Identification,
  prior_nm: number,
): Omit<ScaleCorrection, 'gain_nats' | 'message'> | null {
  const { points, species } = residualPoints(reduction, idn);
  if (points.length < 2) return null;
  const priorW = 1 / (prior_nm * prior_nm);
  const sw = points.reduce((s, p) => s + p.w, 0);
  const pivot = points.reduce((s, p) => s + p.w * p.x_nm, 0) / sw;
  // With the pivot at the weighted mean, offset and scale decouple in the normal equations.
  const offset = points.reduce((s, p) => s + p.w * p.r_nm, 0) / (sw + priorW);
  let offsetSigma = 1 / Math.sqrt(sw + priorW);
  let scale = 0;
  let scaleSigma = 0;
  if (points.length >= 4) {
    const sxx = points.reduce((s, p) => s + p.w * (p.x_nm - pivot) ** 2, 0);
    if (sxx > 0) {
      const b = points.reduce((s, p) => s + p.w * (p.x_nm - pivot) * (p.r_nm - offset), 0) / sxx;
      const bSigma = 1 / Math.sqrt(sxx);
      if (Math.abs(b) >= SIGNIFICANCE * bSigma) {
        scale = b;
        scaleSigma = bSigma;
      }
    }
  }
  // Scatter beyond the stated σ widens the offset's uncertainty (never narrows it).
  const dof = points.length - (scale === 0 ? 1 : 2);
  if (dof > 0) {
    const chi2 = points.reduce((s, p) => s + p.w * (p.r_nm - offset - scale * (p.x_nm - pivot)) ** 2, 0);
    offsetSigma *= Math.sqrt(Math.max(1, chi2 / dof));
  }
  if (Math.abs(offset) < SIGNIFICANCE * offsetSigma && scale === 0) return null;
  return {
    offset_nm: offset,
    offset_sigma_nm: offsetSigma,
    scale,
    scale_sigma: scaleSigma,
    pivot_nm: pivot,
    against: species,
    lines_used: points.length,
  };
}

/**
 * What fitting the correction costs in nats: the Occam factor of each fitted parameter (Laplace
 * approximation of its marginal likelihood under its prior, e.g. MacKay 2003, Information Theory,
 * Inference and Learning Algorithms, ch. 28; from memory). For the offset, of prior N(0, w²) and
 * posterior width σ: ½ ln(w²/σ²) + a²/(2w²). Two lines can always be moved onto some pair of
 * reference lines by an offset; only a correction that explains the lines better than that
 * freedom alone would is kept. A scale term has no stated prior: it costs ½ ln n (the Bayesian
 * information criterion, n the lines used).
 */
export function offsetOccamCost(
  fit: Pick<ScaleCorrection, 'offset_nm' | 'offset_sigma_nm' | 'scale' | 'lines_used'>,
  prior_nm: number,
): number {
  const w2 = prior_nm * prior_nm;
  const s2 = Math.min(w2, fit.offset_sigma_nm * fit.offset_sigma_nm);
  const offset = 0.5 * Math.log(w2 / s2) + (fit.offset_nm * fit.offset_nm) / (2 * w2);
  return offset + (fit.scale === 0 ? 0 : 0.5 * Math.log(fit.lines_used));
}

/** The reduction with the fitted correction removed from the rest-frame wavelengths. */
export function applyReadingOffset(
  reduction: Reduction,
  fit: Pick<ScaleCorrection, 'offset_nm' | 'scale' | 'pivot_nm'>,
): Reduction {
  return {
    ...reduction,
    lines: reduction.lines.map((l) => ({
      ...l,
      rest_vacuum_nm: l.rest_vacuum_nm - fit.offset_nm - fit.scale * (l.rest_vacuum_nm - fit.pivot_nm),
    })),
  };
}

/** "readings run 0.52 ± 0.08 nm long against Hg I: recalibrate". */
export function describeReadingOffset(
  fit: Pick<ScaleCorrection, 'offset_nm' | 'offset_sigma_nm' | 'scale' | 'against'>,
  display: (s: string) => string,
): string {
  const way = fit.offset_nm >= 0 ? 'long' : 'short';
  const scalePart = fit.scale !== 0 ? `, and their scale is off by ${(fit.scale * 100).toFixed(2)} %` : '';
  return `readings run ${Math.abs(fit.offset_nm).toFixed(2)} ± ${fit.offset_sigma_nm.toFixed(2)} nm ${way} against ${fit.against.map(display).join(', ')}${scalePart}: identified on corrected values; recalibrate the instrument`;
}
