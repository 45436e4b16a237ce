/**
 * Mixtures: explain the session with the smallest set of species the evidence supports.
 * Forward selection on the joint log-likelihood ratio plus each species' log prior odds
 * (priors.ts: from data/priors.yaml for the source, else the uninformed prior below, an
 * Occam factor), then the posterior over the explanations visited (the chosen set, each with
 * one species dropped, added or swapped).
 */

import { lowerBound } from '../lines/search.js';
import type { EvidenceContext } from './evidence.js';
import { lineMissCost, rankTerm } from './evidence.js';
import { bestMatching, type ForcedPair, type MatchInput, matchingWith } from './match.js';
import type { ContendingExplanation, Match, PreparedSpecies, RefLine } from './types.js';

/** Real nebulae and the solar spectrum need 8–15 species. */
export const MAX_SPECIES = 15;
/**
 * Largest false-alarm probability (chance of as many matches from random lines) a species with
 * one match and the uninformed prior may have to join; a stronger prior raises it in proportion
 * to its prior odds (see chanceLimit).
 */
export const MAX_FALSE_ALARM = 0.05;
/** …but never beyond this: a match that chance gives half the time is no evidence at all. */
export const MAX_FALSE_ALARM_CAP = 0.5;
const MAX_POOL = 20;

/**
 * The uninformed prior: ½ log N + 1 nats per species for N candidates (a prior that any one of
 * them is present, an information-criterion-style Occam factor; the ½ was chosen on the
 * synthetic benchmark, where log N + 1 lost true second gases).
 */
export function speciesPenalty(candidateCount: number): number {
  return 0.5 * Math.log(Math.max(2, candidateCount)) + 1;
}

/**
 * The false-alarm limit of a species of prior penalty `penalty` (negative log prior odds):
 * posterior odds ≈ prior odds / false-alarm probability must reach what MAX_FALSE_ALARM asks of
 * a species with the uninformed prior.
 */
export function chanceLimit(penalty: number, uninformed: number): number {
  return Math.min(MAX_FALSE_ALARM_CAP, MAX_FALSE_ALARM * Math.exp(uninformed - penalty));
}

export interface ScoredSet {
  species: string[];
  total: number;
  matches: Match[];
}

export function scoreSet(
  set: readonly string[],
  prepared: ReadonlyMap<string, PreparedSpecies>,
  ctx: EvidenceContext,
  penaltyOf: (species: string) => number,
): ScoredSet {
  if (set.length === 0) return { species: [], total: 0, matches: [] };
  // Only the lines some window reaches can match: merge those of each species (small lists).
  const picked: { ref: RefLine; q: number }[] = [];
  let missCost = 0;
  for (const s of set) {
    const p = prepared.get(s);
    if (!p) continue;
    missCost += p.missCost;
    for (const k of p.touched) picked.push({ ref: p.refs[k] as RefLine, q: p.q[k] as number });
  }
  picked.sort((a, b) => a.ref.vacuum_nm - b.ref.vacuum_nm);
  const input: MatchInput = {
    lines: ctx.points,
    refs: picked.map((x) => x.ref),
    cols: picked.map((_, k) => k),
    q: Float64Array.from(picked, (x) => x.q),
    fwhm_nm: ctx.fwhm_nm,
    background_per_nm: ctx.background_per_nm,
  };
  const { matches, gain } = holdFavoured(set, bestMatching(input), input, picked, penaltyOf);
  missCost -= hiddenMissCost(picked, matches, ctx);
  let ranks = 0;
  for (const s of set)
    ranks += rankTerm(
      matches.filter((m) => m.ref.species === s),
      ctx.intensities,
      prepared.get(s)?.flat ?? ctx.flatIntensities,
    ).term;
  let penalty = 0;
  for (const sp of set) penalty += penaltyOf(sp);
  return { species: [...set].sort(), total: missCost + gain + ranks - penalty, matches };
}

/**
 * A species the source makes more likely present than not (prior odds above 1) that loses
 * every line to a closer line of another species is still weighed on its best line: the set
 * "A and B" then means B's likeliest line is B's, at the fit it has, not B explaining nothing.
 * (Hard assignment alone gives a line to the closer reference however weak that line is, so
 * the source's expected species could never be weighed on its own evidence.)
 */
function holdFavoured(
  set: readonly string[],
  matching: { matches: Match[]; gain: number },
  input: MatchInput,
  picked: readonly { ref: RefLine }[],
  penaltyOf: (species: string) => number,
): { matches: Match[]; gain: number } {
  let current = matching;
  const forced: ForcedPair[] = [];
  for (const s of set) {
    if (penaltyOf(s) >= 0 || current.matches.some((m) => m.ref.species === s)) continue;
    let best: { matches: Match[]; gain: number; pair: ForcedPair } | null = null;
    for (let k = 0; k < picked.length; k++) {
      if ((picked[k] as { ref: RefLine }).ref.species !== s) continue;
      for (let i = 0; i < input.lines.length; i++) {
        const pair = { line: i, ref: k };
        const trial = matchingWith(input, [...forced, pair]);
        if (trial && (best === null || trial.gain > best.gain)) best = { ...trial, pair };
      }
    }
    if (best) {
      forced.push(best.pair);
      current = best;
    }
  }
  return current;
}

/**
 * The miss cost of lines hidden under another species' matched line. Two lines of different
 * species closer than one resolution element are one feature on the instrument: when the
 * feature is matched to one of them, the other was not missed, it was not resolved. Its
 * log(1 − q) is given back (as it was weighed in the species' completeness cost).
 */
function hiddenMissCost(
  picked: readonly { ref: RefLine; q: number }[],
  matches: readonly Match[],
  ctx: EvidenceContext,
): number {
  if (matches.length === 0) return 0;
  // By reference position: an optimal matching never crosses, so this is its own order (no copy
  // on this hot path); only a matching with a forced pair (holdFavoured) may cross.
  const ascending = matches.every(
    (m, k) => k === 0 || (matches[k - 1] as Match).ref.vacuum_nm <= m.ref.vacuum_nm,
  );
  const byRef = ascending ? matches : [...matches].sort((a, b) => a.ref.vacuum_nm - b.ref.vacuum_nm);
  const at = Float64Array.from(byRef, (m) => m.ref.vacuum_nm);
  const used = new Set(matches.map((m) => m.ref));
  let cost = 0;
  for (const { ref, q } of picked) {
    if (used.has(ref)) continue;
    const lo = ref.vacuum_nm - ctx.fwhm_nm;
    const hi = ref.vacuum_nm + ctx.fwhm_nm;
    let hidden = false;
    for (let k = lowerBound(at, lo); k < at.length && (at[k] as number) < hi && !hidden; k++)
      hidden = (at[k] as number) > lo && (byRef[k] as Match).ref.species !== ref.species;
    if (hidden) cost += lineMissCost(q, ctx.missWeight, ctx.strongMissWeight);
  }
  return cost;
}

export interface MixtureResult {
  best: ScoredSet;
  visited: ScoredSet[];
}

export function selectMixture(
  singles: readonly {
    species: string;
    score: number;
    false_alarm: number;
    matched: number;
    telluric: boolean;
  }[],
  prepared: ReadonlyMap<string, PreparedSpecies>,
  ctx: EvidenceContext,
  penaltyOf: (species: string) => number,
  uninformed: number,
): MixtureResult {
  const pool = singles
    .filter((s) => s.score > 0)
    .sort((a, b) => b.score - a.score || a.species.localeCompare(b.species))
    .slice(0, MAX_POOL)
    .map((s) => s.species);
  // A species that matches a single line which chance alone would often give is not added
  // to the answer unless its prior makes up for it (Na I in a flame): it would only "explain" a
  // stray line. It still stands as a rival below. Telluric bands are exempt: every ground-based
  // spectrum may show them.
  const mayJoin = new Set(
    singles
      .filter(
        (s) => s.telluric || s.matched >= 2 || s.false_alarm <= chanceLimit(penaltyOf(s.species), uninformed),
      )
      .map((s) => s.species),
  );
  const visited = new Map<string, ScoredSet>();
  const score = (set: readonly string[]): ScoredSet => {
    const key = [...set].sort().join('|');
    const hit = visited.get(key);
    if (hit) return hit;
    const scored = scoreSet(set, prepared, ctx, penaltyOf);
    visited.set(key, scored);
    return scored;
  };
  // A set in which some species explains no line is not an explanation of these lines (a strong
  // prior alone would otherwise lift it above the answer).
  const explains = (v: ScoredSet) => v.species.every((sp) => v.matches.some((m) => m.ref.species === sp));
  // An answer may hold only species allowed to join (the chance guard) and must explain with each.
  const admissible = (v: ScoredSet) => explains(v) && v.species.every((sp) => mayJoin.has(sp));
  /** Forward selection from `start`: add the species that raises the total most, while one does. */
  const grow = (start: ScoredSet): ScoredSet => {
    let current = start;
    while (current.species.length < MAX_SPECIES) {
      let next: ScoredSet | null = null;
      for (const s of pool) {
        if (current.species.includes(s) || !mayJoin.has(s)) continue;
        const trial = score([...current.species, s]);
        // A species joins only for the lines it explains, never for its prior alone, and not by
        // taking the last line of one already in (which would then explain nothing).
        if (!explains(trial)) continue;
        if (next === null || trial.total > next.total) next = trial;
      }
      if (next === null || next.total <= current.total) break;
      current = next;
    }
    return current;
  };
  /** Neighbours of an answer (one species dropped, added or swapped), so the posterior knows its rivals. */
  const neighbours = (current: ScoredSet) => {
    for (const s of current.species) score(current.species.filter((x) => x !== s));
    for (const c of pool) {
      if (current.species.includes(c)) continue;
      score([...current.species, c]);
      for (const s of current.species) score([...current.species.filter((x) => x !== s), c]);
    }
  };
  // Greedy growth can stop at a set no single addition improves while a swap does (He II taking
  // both Balmer lines its Pickering lines coincide with, so that H I could not join without
  // leaving He II nothing): move to the best admissible neighbour and grow again, until none beats
  // the answer.
  let current = grow(score([]));
  for (let round = 0; round < 4; round++) {
    neighbours(current);
    let best = current;
    for (const v of visited.values()) if (admissible(v) && v.total > best.total) best = v;
    if (best === current) break;
    current = grow(best);
  }
  return { best: current, visited: [...visited.values()].filter(explains) };
}

/** Posterior probabilities of the visited explanations (softmax of their totals). */
export function posterior(visited: readonly ScoredSet[], temperature = 1): ContendingExplanation[] {
  const max = Math.max(...visited.map((v) => v.total));
  const weights = visited.map((v) => Math.exp((v.total - max) * temperature));
  const sum = weights.reduce((a, b) => a + b, 0);
  return visited
    .map((v, i) => ({ species: v.species, score: v.total, probability: (weights[i] as number) / sum }))
    .sort((a, b) => b.probability - a.probability || a.species.join().localeCompare(b.species.join()));
}
