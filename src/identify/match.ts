/**
 * Optimal one-to-one matching of measured lines to reference lines. Both lists lie on one
 * axis and the gain falls with distance, so an optimal matching never crosses: a dynamic
 * programme over the two sorted lists finds the maximum-gain matching exactly (not first-come).
 * Only reference lines inside some line's window take part, found by binary search.
 */
import { lowerBound } from '../lines/search.js';
import { matchGain, pairSigma, WINDOW_SIGMAS } from './model.js';
import type { Match, RefLine } from './types.js';

export interface MeasuredPoint {
  vacuum_nm: number;
  sigma_nm: number;
}

export interface MatchInput {
  lines: readonly MeasuredPoint[];
  refs: readonly RefLine[];
  /** Indices of the refs that some line's window reaches, ascending (see touchedRefs). */
  cols: readonly number[];
  /** Detection probability of each ref (indexed like refs). */
  q: Float64Array;
  fwhm_nm: number;
  background_per_nm: number;
}

/** Indices of the reference lines inside any measured line's window, ascending, by binary search. */
export function touchedRefs(
  lines: readonly MeasuredPoint[],
  refCentres: Float64Array,
  maxUnc_nm: number,
  fwhm_nm: number,
): number[] {
  const touched = new Set<number>();
  for (const line of lines) {
    const half = WINDOW_SIGMAS * pairSigma(line.sigma_nm, maxUnc_nm, fwhm_nm);
    const start = lowerBound(refCentres, line.vacuum_nm - half);
    for (let k = start; k < refCentres.length && (refCentres[k] as number) <= line.vacuum_nm + half; k++)
      touched.add(k);
  }
  return [...touched].sort((a, b) => a - b);
}

export function bestMatching(input: MatchInput): { matches: Match[]; gain: number } {
  const { lines, refs, cols, q, fwhm_nm, background_per_nm } = input;
  const n = lines.length;
  const m = cols.length;
  if (m === 0 || n === 0) return { matches: [], gain: 0 };

  const gainOf = (i: number, c: number): number => {
    const line = lines[i] as MeasuredPoint;
    const ref = refs[cols[c] as number] as RefLine;
    const sigma = pairSigma(line.sigma_nm, ref.unc_nm, fwhm_nm);
    const delta = line.vacuum_nm - ref.vacuum_nm;
    if (Math.abs(delta) > WINDOW_SIGMAS * sigma) return Number.NEGATIVE_INFINITY;
    return matchGain(delta, sigma, q[cols[c] as number] as number, background_per_nm);
  };

  const width = m + 1;
  const table = new Float64Array((n + 1) * width);
  for (let i = 1; i <= n; i++) {
    for (let c = 1; c <= m; c++) {
      const skipLine = table[(i - 1) * width + c] as number;
      const skipRef = table[i * width + c - 1] as number;
      const g = gainOf(i - 1, c - 1);
      const take = g > 0 ? (table[(i - 1) * width + c - 1] as number) + g : Number.NEGATIVE_INFINITY;
      table[i * width + c] = Math.max(skipLine, skipRef, take);
    }
  }
  const matches: Match[] = [];
  let i = n;
  let c = m;
  while (i > 0 && c > 0) {
    const here = table[i * width + c] as number;
    if (here === (table[(i - 1) * width + c] as number)) i--;
    else if (here === (table[i * width + c - 1] as number)) c--;
    else {
      const ref = refs[cols[c - 1] as number] as RefLine;
      const line = lines[i - 1] as MeasuredPoint;
      matches.push({
        line: i - 1,
        ref,
        residual_nm: line.vacuum_nm - ref.vacuum_nm,
        gain: gainOf(i - 1, c - 1),
      });
      i--;
      c--;
    }
  }
  matches.reverse();
  return { matches, gain: table[n * width + m] as number };
}

/** A measured line (index into lines) held to a reference (index into refs). */
export interface ForcedPair {
  line: number;
  ref: number;
}

/**
 * The best matching in which each forced reference takes its measured line: those pairs'
 * gains plus the best matching of the other lines to the other references. Null when a pair
 * is outside its window or no better than background (bestMatching takes only gains above 0),
 * or two pairs share a line. The rest may cross the forced pairs (matches come back sorted by
 * line).
 */
export function matchingWith(
  input: MatchInput,
  forced: readonly ForcedPair[],
): { matches: Match[]; gain: number } | null {
  const held: Match[] = [];
  let heldGain = 0;
  for (const pair of forced) {
    const line = input.lines[pair.line] as MeasuredPoint;
    const ref = input.refs[pair.ref] as RefLine;
    const sigma = pairSigma(line.sigma_nm, ref.unc_nm, input.fwhm_nm);
    const delta = line.vacuum_nm - ref.vacuum_nm;
    if (Math.abs(delta) > WINDOW_SIGMAS * sigma || held.some((m) => m.line === pair.line)) return null;
    const gain = matchGain(delta, sigma, input.q[pair.ref] as number, input.background_per_nm);
    if (gain <= 0) return null;
    held.push({ line: pair.line, ref, residual_nm: delta, gain });
    heldGain += gain;
  }
  const others = input.lines.map((_, i) => i).filter((i) => !forced.some((p) => p.line === i));
  const rest = bestMatching({
    ...input,
    lines: others.map((i) => input.lines[i] as MeasuredPoint),
    cols: input.cols.filter((c) => !forced.some((p) => p.ref === c)),
  });
  const matches = rest.matches.map((m) => ({ ...m, line: others[m.line] as number }));
  matches.push(...held);
  matches.sort((a, b) => a.line - b.line);
  return { matches, gain: rest.gain + heldGain };
}
