/**
 * Faint lines: a measured line the explanation leaves over may be a weak line of a species the
 * explanation already holds. The catalog keeps such lines apart (Catalog.faint: rows flagged
 * `faint`, below each spectrum's threshold) and identification never weighs them as evidence:
 * hundreds of weak lines per species would let any species collect matches by chance
 * (docs/catalog.md, "Thresholds"). Here they only name the likeliest source of a leftover line.
 *
 * The weight of species S for a leftover line at x is, as in the evidence model (model.ts),
 * Σ_k exp(gain(x − λ_k; q_S)) over S's faint lines in the window, against 1 for background.
 * The detection probability of a faint line is at most Q_FAINT, and never more than the
 * leftover lines could fill: with U lines left over and N faint lines of S in range, at most
 * U of the N can have been seen, so q_S = min(Q_FAINT, U / N). A species with many faint
 * lines therefore gains little from each.
 */
import { FAINT_FLAG } from '../lines/parse.js';
import { windowRange } from '../lines/search.js';
import type { Catalog, SpeciesLines } from '../lines/types.js';
import type { MeasuredPoint } from './match.js';
import { matchGain, pairSigma, WINDOW_SIGMAS } from './model.js';
import type { RefLine } from './types.js';

/**
 * Detection probability of a faint line: a quarter of Q_WEAK (model.ts), the probability of a
 * weighed line below the session's detection limit, since faint lines are weaker than every
 * weighed line of their spectrum. Our choice, not a measurement.
 */
export const Q_FAINT = 0.03;

export interface FaintContext {
  catalog: Catalog;
  /** Species the explanation holds (non-telluric: faint lines are compared at rest). */
  species: readonly string[];
  range_nm: readonly [number, number];
  fwhm_nm: number;
  background_per_nm: number;
  /** Measured lines nothing else explains. */
  leftovers: number;
}

/** Whether an assignment is to a faint line: such lines never move a fitted shift or offset. */
export function toFaintLine(assignment: { flags: readonly string[] }): boolean {
  return assignment.flags.includes(FAINT_FLAG);
}

const widest = new WeakMap<SpeciesLines, number>();
function widestUnc(lines: SpeciesLines): number {
  let w = widest.get(lines);
  if (w === undefined) {
    w = lines.unc_nm.reduce((m, u) => Math.max(m, u), 0);
    widest.set(lines, w);
  }
  return w;
}

function faintRef(lines: SpeciesLines, k: number): RefLine {
  return {
    species: lines.species,
    vacuum_nm: lines.vacuum_nm[k] as number,
    unc_nm: lines.unc_nm[k] as number,
    intensity: lines.intensity[k] as number,
    flags: lines.flags[k] ?? [],
    members: 1,
  };
}

/**
 * For each explained species with faint lines near a leftover line: its likeliest faint line
 * and the species' weight (against 1 for background), to weigh beside the tentative guesses.
 */
export function faintWeights(point: MeasuredPoint, ctx: FaintContext): { ref: RefLine; weight: number }[] {
  if (ctx.leftovers <= 0) return [];
  const out: { ref: RefLine; weight: number }[] = [];
  for (const species of ctx.species) {
    const lines = ctx.catalog.faint.get(species);
    if (!lines || lines.vacuum_nm.length === 0) continue;
    const [from, to] = windowRange(lines.vacuum_nm, ctx.range_nm[0], ctx.range_nm[1]);
    const inRange = to - from;
    if (inRange === 0) continue;
    const q = Math.min(Q_FAINT, ctx.leftovers / inRange);
    // Search as far as the least certain faint line of the species could be matched.
    const reach = WINDOW_SIGMAS * pairSigma(point.sigma_nm, widestUnc(lines), ctx.fwhm_nm);
    const [a, b] = windowRange(lines.vacuum_nm, point.vacuum_nm - reach, point.vacuum_nm + reach);
    let weight = 0;
    let top: { k: number; w: number } | null = null;
    for (let k = a; k < b; k++) {
      const sigma = pairSigma(point.sigma_nm, lines.unc_nm[k] as number, ctx.fwhm_nm);
      const d = point.vacuum_nm - (lines.vacuum_nm[k] as number);
      if (Math.abs(d) > WINDOW_SIGMAS * sigma) continue;
      const w = Math.exp(Math.min(50, matchGain(d, sigma, q, ctx.background_per_nm)));
      weight += w;
      if (top === null || w > top.w) top = { k, w };
    }
    if (top !== null) out.push({ ref: faintRef(lines, top.k), weight });
  }
  return out;
}
