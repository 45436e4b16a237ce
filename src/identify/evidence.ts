/**
 * Per-species evidence: profile the detection limit, match optimally, and weigh position
 * agreement, completeness, intensity ranks and chance.
 */
import { binomialUpperTail, coveredLength } from './chance.js';
import { bestMatching, type MeasuredPoint, touchedRefs } from './match.js';
import { pairSigma, Q_STRONG, Q_WEAK, RANK_WEIGHT, WINDOW_SIGMAS } from './model.js';
import { spearman } from './ranks.js';
import type { Match, PreparedSpecies, RefLine, SpeciesEvidence } from './types.js';

export interface EvidenceContext {
  points: readonly MeasuredPoint[];
  /** Measured intensities, aligned with `points` (null where not given). */
  intensities: readonly (number | null)[];
  range_nm: [number, number];
  fwhm_nm: number;
  background_per_nm: number;
  medianSigma_nm: number;
  /**
   * Weight of the cost of lines predicted but not listed (1 for a complete list of a source whose
   * catalog intensities hold; less for a selection or distrusted intensities, see model.ts).
   */
  missWeight: number;
  /** The same for lines at or above the profiled detection limit (model.ts strongMissWeight). */
  strongMissWeight: number;
  /** The catalog's intensities do not predict this source's lines: flat detection, no rank term. */
  flatIntensities: boolean;
}

const MAX_THRESHOLDS = 14;

/**
 * Candidate detection limits: distinct intensities, thinned to at most MAX_THRESHOLDS, plus "none
 * strong". Strength 0 (a line a condition table does not list, prepare.ts conditionLines) is
 * never a limit: such a line is weaker than every listed one, so it is never counted strong.
 */
function thresholdCandidates(refs: readonly RefLine[]): number[] {
  const distinct = [...new Set(refs.map((r) => r.intensity))].filter((v) => v > 0).sort((a, b) => b - a);
  const picks: number[] = [];
  const step = Math.max(1, distinct.length / MAX_THRESHOLDS);
  for (let x = 0; x < distinct.length; x += step) picks.push(distinct[Math.floor(x)] as number);
  picks.push(Number.POSITIVE_INFINITY);
  return picks;
}

const LOG_MISS_STRONG = Math.log1p(-Q_STRONG);
const LOG_MISS_WEAK = Math.log1p(-Q_WEAK);

/** The completeness cost of one reference line of detection probability q, as weighed. */
export function lineMissCost(q: number, missWeight: number, strongMissWeight: number): number {
  return q === Q_STRONG ? strongMissWeight * LOG_MISS_STRONG : missWeight * Math.log1p(-q);
}

export function detectionProbabilities(
  refs: readonly RefLine[],
  threshold: number,
  missWeight = 1,
  strongMissWeight = missWeight,
): { q: Float64Array; missCost: number } {
  // One plain loop: this runs for every species, detection limit and trial shift (hot).
  const n = refs.length;
  const q = new Float64Array(n);
  let strong = 0;
  for (let k = 0; k < n; k++) {
    if ((refs[k] as RefLine).intensity >= threshold) {
      q[k] = Q_STRONG;
      strong++;
    } else q[k] = Q_WEAK;
  }
  const missCost = strong * strongMissWeight * LOG_MISS_STRONG + (n - strong) * missWeight * LOG_MISS_WEAK;
  return { q, missCost };
}

export function rankTerm(
  matches: readonly Match[],
  intensities: readonly (number | null)[],
  flat = false,
): { term: number; rho: number | null } {
  if (flat) return { term: 0, rho: null };
  const pairs = matches.filter((m) => intensities[m.line] !== null && intensities[m.line] !== undefined);
  const rho = spearman(
    pairs.map((m) => intensities[m.line] as number),
    pairs.map((m) => m.ref.intensity),
  );
  if (rho === null) return { term: 0, rho: null };
  return { term: (RANK_WEIGHT * rho * (pairs.length - 1)) / 2, rho };
}

export function evaluateSpecies(
  species: string,
  refs: RefLine[],
  ctx: EvidenceContext,
  telluric: boolean,
): { evidence: SpeciesEvidence; prepared: PreparedSpecies } {
  const refCentres = Float64Array.from(refs, (r) => r.vacuum_nm);
  const maxUnc = refs.reduce((m, r) => Math.max(m, r.unc_nm), 0);
  const cols = touchedRefs(ctx.points, refCentres, maxUnc, ctx.fwhm_nm);
  let best: { llr: number; threshold: number; q: Float64Array; missCost: number; matches: Match[] } | null =
    null;
  // Distrusted intensities: every line equally likely to show (one threshold below all). With no
  // line in reach nothing can match, and "none strong" (the last candidate) costs least.
  const thresholds = ctx.flatIntensities
    ? [0]
    : cols.length === 0
      ? [Number.POSITIVE_INFINITY]
      : thresholdCandidates(refs);
  for (const threshold of thresholds) {
    const { q, missCost } = detectionProbabilities(refs, threshold, ctx.missWeight, ctx.strongMissWeight);
    const { matches, gain } = bestMatching({
      lines: ctx.points,
      refs,
      cols,
      q,
      fwhm_nm: ctx.fwhm_nm,
      background_per_nm: ctx.background_per_nm,
    });
    const llr = missCost + gain + rankTerm(matches, ctx.intensities, ctx.flatIntensities).term;
    if (best === null || llr > best.llr) best = { llr, threshold, q, missCost, matches };
  }
  const chosen = best ?? {
    llr: 0,
    threshold: Number.POSITIVE_INFINITY,
    q: new Float64Array(),
    missCost: 0,
    matches: [],
  };
  const matchedRefs = new Set(chosen.matches.map((m) => m.ref));
  // Reported detection limit: the weakest reference line that was seen (the definition);
  // the score itself uses the profiled limit above.
  const weakestSeen = Math.min(...chosen.matches.map((m) => m.ref.intensity));
  const strong = chosen.matches.length > 0 ? refs.filter((r) => r.intensity >= weakestSeen) : [];
  const rank = rankTerm(chosen.matches, ctx.intensities, ctx.flatIntensities);
  const halfWidth = WINDOW_SIGMAS * pairSigma(ctx.medianSigma_nm, 0, ctx.fwhm_nm);
  const covered = coveredLength(
    refs.map((r) => r.vacuum_nm),
    halfWidth,
    ctx.range_nm[0],
    ctx.range_nm[1],
  );
  const fraction = covered / Math.max(1e-9, ctx.range_nm[1] - ctx.range_nm[0]);
  const residuals = chosen.matches.map((m) => m.residual_nm);
  return {
    evidence: {
      species,
      score: chosen.llr,
      matched: chosen.matches.length,
      expected: strong.length,
      missing_nm: strong.filter((r) => !matchedRefs.has(r)).map((r) => r.vacuum_nm),
      false_alarm: binomialUpperTail(ctx.points.length, fraction, chosen.matches.length),
      rank_correlation: rank.rho,
      rms_residual_nm:
        residuals.length > 0 ? Math.sqrt(residuals.reduce((a, r) => a + r * r, 0) / residuals.length) : null,
      matches: chosen.matches,
      confidence: 0,
      telluric,
    },
    prepared: {
      species,
      refs,
      touched: cols,
      q: chosen.q,
      missCost: chosen.missCost,
      threshold: chosen.threshold,
      flat: ctx.flatIntensities,
    },
  };
}
