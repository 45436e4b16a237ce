/**
 * The identify stage: reduced lines + catalog → ranked candidates, an explanation and a
 * line-by-line assignment. Pure.
 */

import { FWHM_PER_SIGMA, SPEED_OF_LIGHT_KM_S } from '../constants.js';
import type { Diagnostic } from '../diagnostics.js';
import type { Catalog } from '../lines/types.js';
import { airToVacuum, vacuumToAir } from '../reduce/airVacuum.js';
import { redshiftFromVelocity, residualVelocity_km_s } from '../reduce/doppler.js';
import type { MeasuredLine, Reduction } from '../reduce/types.js';
import { positionOfField } from '../session/normalize.js';
import { candidateSpecies, isTelluric } from './candidates.js';
import { closePairs, describeClosePairs } from './closePairs.js';
import { type EvidenceContext, evaluateSpecies } from './evidence.js';
import { posterior, selectMixture, speciesPenalty } from './explain.js';
import { type FaintContext, faintWeights, toFaintLine } from './faint.js';
import type { MeasuredPoint } from './match.js';
import {
  calibratedConfidence,
  IDENTIFIED_THRESHOLD,
  matchGain,
  missWeight,
  pairSigma,
  Q_STRONG,
  statusFor,
  strongMissWeight,
  TENTATIVE_MIN,
  WINDOW_SIGMAS,
} from './model.js';
import { displayName } from './notation.js';
import { conditionLines, refsInRange } from './prepare.js';
import { priorPenalty, sessionPriors } from './priors.js';
import {
  applyReadingOffset,
  describeReadingOffset,
  fitReadingOffset,
  offsetOccamCost,
} from './scaleOffset.js';
import { searchShift } from './shiftSearch.js';
import { describeExplanation } from './summary.js';
import type {
  AssignedLine,
  Explanation,
  Identification,
  LineStatus,
  Match,
  PreparedSpecies,
  RefLine,
  SpeciesEvidence,
} from './types.js';

/** Lines a measurement gives no σ for are never narrower than this (avoids zero-width windows). */
export const MIN_SIGMA_NM = 0.005;

export interface IdentifyOutcome {
  identification: Identification;
  /** The reduction as identified: with a searched shift applied when one was found. */
  reduction: Reduction;
  warnings: Diagnostic[];
}

/** The identify stage: a known shift was removed by reduce; a searched one is found here. */
export function identify(reduction: Reduction, catalog: Catalog): IdentifyOutcome {
  const { species: pool, warnings } = candidateSpecies(reduction.session, catalog);
  const note = (code: string, field: string, message: string, hint: string) =>
    warnings.push({
      file: reduction.session.file,
      ...positionOfField(reduction.session, field),
      severity: 'warning',
      code,
      field,
      message,
      hint,
    });
  if (pool.length === 0) {
    note(
      'no-candidates',
      'candidates',
      'no candidate species are left to compare the lines with',
      'name existing groups or species, or remove candidates: to use the defaults',
    );
  }
  if (reduction.lines.length < 3) {
    note(
      'few-lines',
      'lines',
      `with ${reduction.lines.length} line${reduction.lines.length === 1 ? '' : 's'} the identification rests on little evidence`,
      'measure more lines: the result is a weak one',
    );
  }
  if (reduction.lines.some((l) => l.sigma_nm === 0)) {
    note(
      'zero-sigma',
      'lines',
      'a reading has zero uncertainty; its window uses the instrument resolution and a 0.005 nm floor',
      'give the real uncertainty of the reading (sigma)',
    );
  }
  const pairs = closePairs(reduction.lines, reduction.resolution_nm);
  if (pairs.length > 0 && reduction.resolution_nm !== null) {
    const at = pairs[0]?.second as MeasuredLine;
    warnings.push({
      file: reduction.session.file,
      ...at.position,
      severity: 'warning',
      code: 'lines-closer-than-resolution',
      field: `lines[${at.index}]`,
      message: describeClosePairs(pairs, reduction.resolution_nm),
      hint: 'state the resolution the instrument really has (instrument.resolution_nm), or remove a line listed twice',
    });
  }
  const request = reduction.session.shift;
  const core = (r: Reduction) => identifyAtRest(r, catalog);
  if (request.mode === 'redshift-search' || request.mode === 'velocity-search') {
    const range =
      request.mode === 'redshift-search'
        ? { mode: 'redshift' as const, z_from: request.from, z_to: request.to }
        : {
            mode: 'velocity' as const,
            z_from: redshiftFromVelocity(request.from_km_s),
            z_to: redshiftFromVelocity(request.to_km_s),
          };
    const searched = searchShift(reduction, catalog, core, range, (r) => scoreAtRest(r, catalog));
    if (searched) {
      if (searched.found.warning) {
        warnings.push({
          file: reduction.session.file,
          ...positionOfField(reduction.session, 'shift'),
          severity: 'warning',
          code: 'shift-uncertain',
          field: 'shift',
          message: searched.found.warning,
          hint: 'add lines or narrow the search range',
        });
      }
      return { identification: searched.identification, reduction: searched.reduction, warnings };
    }
  }
  const first = core(reduction);
  const corrected =
    reduction.session.measurement.method === 'wavelength' ? withReadingOffset(reduction, first, core) : null;
  if (corrected?.identification.scale) {
    note(
      'reading-offset',
      'lines',
      corrected.identification.scale.message,
      'calibrate against a lamp of known lines (method pixel, or readings of a reference lamp)',
    );
    return { identification: corrected.identification, reduction: corrected.reduction, warnings };
  }
  const identification = first;
  if (identification.candidates.length === 0 && pool.length > 0) {
    const [a, b] = identification.range_nm;
    note(
      'outside-catalog',
      'lines',
      `no candidate species has a reference line between ${a.toFixed(0)} and ${b.toFixed(0)} nm (rest, vacuum)`,
      'check the unit (nm, angstrom, um) and the medium, or widen the candidates',
    );
  }
  return { identification, reduction, warnings };
}

/**
 * A second identification on readings corrected for a fitted offset (and scale), kept only
 * when it explains the lines at least as well and identifies at least as many of them.
 */
function withReadingOffset(
  reduction: Reduction,
  first: Identification,
  core: (r: Reduction) => Identification,
): { identification: Identification; reduction: Reduction } | null {
  // Refit on each new identification (its assignments may change once the lines move), from
  // the uncorrected readings; two rounds settle every case we have seen.
  let fit = fitReadingOffset(reduction, first, first.fwhm_nm);
  if (!fit) return null;
  let correctedReduction = applyReadingOffset(reduction, fit);
  let second = core(correctedReduction);
  for (let round = 0; round < 2; round++) {
    const refit = fitReadingOffset(reduction, second, first.fwhm_nm);
    if (!refit || Math.abs(refit.offset_nm - fit.offset_nm) < 0.1 * refit.offset_sigma_nm) break;
    fit = refit;
    correctedReduction = applyReadingOffset(reduction, fit);
    second = core(correctedReduction);
  }
  // Lines given to faint lines do not count: they follow the explanation, they do not test it.
  const identified = (idn: Identification) =>
    idn.lines.filter((l) => l.status === 'identified' && !(l.assignment && toFaintLine(l.assignment))).length;
  const gain = second.explanation.score - first.explanation.score;
  if (gain < offsetOccamCost(fit, first.fwhm_nm) || identified(second) < identified(first)) return null;
  const display = (s: string) => second.display[s] ?? s;
  return {
    reduction: correctedReduction,
    identification: {
      ...second,
      scale: { ...fit, gain_nats: gain, message: describeReadingOffset(fit, display) },
    },
  };
}

/** The best explanation's score at rest, as identifyAtRest gives it, without the line-by-line part. */
export function scoreAtRest(reduction: Reduction, catalog: Catalog): number {
  const { mixture } = weighAtRest(reduction, catalog);
  return mixture.best.species.length === 0 ? 0 : mixture.best.total;
}

/** The evidence of every candidate species and the chosen mixture, for lines in their rest frame. */
function weighAtRest(reduction: Reduction, catalog: Catalog) {
  const { species: pool } = candidateSpecies(reduction.session, catalog);
  const priors = sessionPriors(reduction.session, catalog);
  const uninformed = speciesPenalty(Math.max(pool.length, 2));
  const penaltyOf = (s: string) => priorPenalty(priors, s, uninformed);
  const z = reduction.shift?.z ?? 0;
  const sorted = [...reduction.lines].sort(
    (a, b) => a.rest_vacuum_nm - b.rest_vacuum_nm || a.index - b.index,
  );
  // A source whose line centres scatter about their rest wavelengths (a quasar's broad lines)
  // reads each line no closer than that scatter, whatever the instrument's σ.
  const scatter = priors.lineScatter_km_s / SPEED_OF_LIGHT_KM_S;
  const points: MeasuredPoint[] = sorted.map((l) => ({
    vacuum_nm: l.rest_vacuum_nm,
    sigma_nm: Math.hypot(Math.max(l.rest_sigma_nm, MIN_SIGMA_NM), l.rest_vacuum_nm * scatter),
  }));
  const sigmas = points.map((p) => p.sigma_nm).sort((a, b) => a - b);
  const medianSigma = sigmas[Math.floor(sigmas.length / 2)] ?? 0.5;
  const fwhm =
    reduction.resolution_nm !== null
      ? reduction.resolution_nm / (1 + z)
      : Math.max(FWHM_PER_SIGMA * medianSigma, 0.05);
  const range = expectedRange(reduction, sorted, z, fwhm);
  const flat = priors.labIntensities === 'distrust';
  const ctx: EvidenceContext = {
    points,
    intensities: sorted.map((l) => l.intensity),
    range_nm: range,
    fwhm_nm: fwhm,
    background_per_nm: Math.max(1, points.length) / (range[1] - range[0]),
    medianSigma_nm: medianSigma,
    missWeight: missWeight(priors.linesListed, flat),
    strongMissWeight: strongMissWeight(priors.linesListed, flat),
    flatIntensities: flat,
  };

  const trustedCtx: EvidenceContext = {
    ...ctx,
    flatIntensities: false,
  };

  // A band seen only in absorption (the telluric O2 and H2O bands, flag `absorption-only`)
  // cannot be an emission line, nor an airglow emission band (`emission-only`) a dark line: in
  // a session of lines of one kind, the rows of the other take no part.
  const emissionOnly = sorted.every((l) => l.kind === 'emission');
  const absorptionOnly = sorted.every((l) => l.kind === 'absorption');
  const otherKind = emissionOnly ? 'absorption-only' : absorptionOnly ? 'emission-only' : null;
  const prepared = new Map<string, PreparedSpecies>();
  const evidence: SpeciesEvidence[] = [];
  for (const name of pool) {
    const lines = catalog.species.get(name);
    if (!lines) continue;
    const telluric = isTelluric(catalog, name);
    // Telluric lines arise in the observer's frame: compare them at observed wavelengths.
    const scale = telluric ? 1 / (1 + z) : 1;
    // A species the source's condition table gives strengths for is weighed by them, as a
    // source whose intensities hold; any other keeps the lab column under the kind's trust.
    const condition = conditionLines(lines, priors.intensities);
    const own = condition === lines ? ctx : trustedCtx;
    const refs = refsInRange(condition, range[0] / scale, range[1] / scale, fwhm / scale, {
      points: Float64Array.from(points, (p) => p.vacuum_nm / scale),
      halfWidth_nm: (WINDOW_SIGMAS * pairSigma(medianSigma, 0, fwhm)) / scale,
    })
      .filter((r) => otherKind === null || !r.flags.includes(otherKind))
      .map((r) => (scale === 1 ? r : { ...r, vacuum_nm: r.vacuum_nm * scale }));
    if (refs.length === 0) continue;
    const result = evaluateSpecies(name, refs, own, telluric);
    prepared.set(name, result.prepared);
    evidence.push(result.evidence);
  }

  const mixture = selectMixture(evidence, prepared, ctx, penaltyOf, uninformed);
  return { pool, priors, penaltyOf, sorted, points, fwhm, range, ctx, prepared, evidence, mixture };
}

/** Identification of lines already in their rest frame. */
export function identifyAtRest(reduction: Reduction, catalog: Catalog): Identification {
  const { pool, priors, penaltyOf, sorted, points, fwhm, range, ctx, prepared, evidence, mixture } =
    weighAtRest(reduction, catalog);
  const contenders = posterior(mixture.visited);
  for (const e of evidence) {
    e.confidence = contenders
      .filter((c) => c.species.includes(e.species))
      .reduce((a, c) => a + c.probability, 0);
  }
  evidence.sort((a, b) => b.score - a.score || a.species.localeCompare(b.species));
  const shareOf = new Map(evidence.map((e) => [e.species, e.confidence]));

  const best = mixture.best;
  const bestKey = best.species.join('|');
  const rawConfidence = contenders.find((c) => c.species.join('|') === bestKey)?.probability ?? 0;
  const confidence = calibratedConfidence(rawConfidence);
  const status = statusFor(best.species, confidence);
  const assignedByPoint = new Map(best.matches.map((m) => [m.line, m]));
  const chosenSet = new Set(best.species);
  const display = displayNames(pool, prepared, best.matches);
  const faint: FaintContext = {
    catalog,
    species: best.species.filter((sp) => !isTelluric(catalog, sp)),
    range_nm: range,
    fwhm_nm: fwhm,
    background_per_nm: ctx.background_per_nm,
    leftovers: sorted.length - assignedByPoint.size,
  };
  // A species of the answer is confirmed when (nearly) every weighed explanation holds it, even
  // while the exact set is in doubt: Hg I in a tube whose phosphors are uncertain is still Hg I.
  const confirmed = (sp: string) =>
    status !== 'unexplained' && chosenSet.has(sp) && (shareOf.get(sp) ?? 0) >= IDENTIFIED_THRESHOLD;
  const lines: AssignedLine[] = sorted.map((line, i) => {
    const point = points[i] as MeasuredPoint;
    const m = assignedByPoint.get(i);
    let lineStatus: LineStatus = 'unexplained';
    let probability = 0;
    let ref: RefLine | null = null;
    if (m) {
      ref = m.ref;
      // The line's species is confirmed when it is in (nearly) every weighed explanation.
      probability = shareOf.get(m.ref.species) ?? rawConfidence;
      lineStatus = confirmed(m.ref.species) ? 'identified' : 'tentative';
    } else {
      const guess = tentativeFor(
        point,
        prepared,
        evidence,
        chosenSet,
        ctx,
        penaltyOf,
        faintWeights(point, faint),
      );
      if (guess && guess.probability >= TENTATIVE_MIN) {
        ref = guess.ref;
        probability = guess.probability;
        // A faint line of a confirmed species, and probably this line: identified with it.
        lineStatus =
          toFaintLine(ref) && confirmed(ref.species) && probability >= IDENTIFIED_THRESHOLD
            ? 'identified'
            : 'tentative';
      }
    }
    return {
      index: line.index,
      status: lineStatus,
      probability,
      assignment: ref ? assignmentOf(point, ref) : null,
      alternatives: alternativesFor(point, ref, prepared, evidence, fwhm),
    };
  });
  lines.sort((a, b) => a.index - b.index);
  const unexplained = lines.filter((l) => l.status === 'unexplained').map((l) => l.index);
  const tentative = [
    ...new Set(lines.filter((l) => l.status === 'tentative').map((l) => l.assignment?.species ?? '')),
  ]
    .filter(
      (sp) => sp !== '' && !lines.some((l) => l.status === 'identified' && l.assignment?.species === sp),
    )
    .sort();
  const shown = contenders.filter((c) => c.probability >= 0.01).slice(0, 5);
  const discriminators =
    status === 'ambiguous'
      ? findDiscriminators(best.species, shown, prepared, catalog, range, fwhm, points)
      : [];
  const explanation: Explanation = {
    species: best.species,
    confidence,
    raw_confidence: rawConfidence,
    status,
    telluric: best.species.filter((sp) => isTelluric(catalog, sp)),
    tentative,
    unexplained,
    contenders: shown,
    discriminators,
    summary: '',
    score: best.total,
  };
  explanation.summary = describeExplanation(explanation, lines, reduction.medium, display);
  return {
    candidates: evidence,
    explanation,
    lines,
    considered: pool,
    range_nm: range,
    fwhm_nm: fwhm,
    shift: null,
    display,
    scale: null,
    lines_listed: { value: priors.linesListed, stated: priors.linesListedStated },
  };
}

function assignmentOf(point: MeasuredPoint, ref: RefLine): NonNullable<AssignedLine['assignment']> {
  return {
    species: ref.species,
    display: displayName(ref.species, [ref.flags]),
    ref_vacuum_nm: ref.vacuum_nm,
    residual_nm: point.vacuum_nm - ref.vacuum_nm,
    residual_km_s: residualVelocity_km_s(point.vacuum_nm - ref.vacuum_nm, ref.vacuum_nm),
    blend: ref.members > 1,
    flags: ref.flags,
  };
}

/** Each species in notation: from the flags of its lines assigned here, else of its lines in range. */
function displayNames(
  pool: readonly string[],
  prepared: ReadonlyMap<string, PreparedSpecies>,
  matches: readonly Match[],
): Record<string, string> {
  const out: Record<string, string> = {};
  for (const s of pool) {
    const own = matches.filter((m) => m.ref.species === s).map((m) => m.ref.flags);
    out[s] = displayName(s, own.length ? own : (prepared.get(s)?.refs.map((r) => r.flags) ?? []));
  }
  return out;
}

/**
 * The best plausible assignment of a line the explanation leaves over: each candidate species'
 * nearest line in the window weighs exp(gain − prior penalty) against 1 for "background", so
 * the probability is that of the line coming from it rather than from chance or another species.
 * Faint lines of the explained species (faint.ts) compete with the same weights.
 */
function tentativeFor(
  point: MeasuredPoint,
  prepared: ReadonlyMap<string, PreparedSpecies>,
  evidence: readonly SpeciesEvidence[],
  chosen: ReadonlySet<string>,
  ctx: EvidenceContext,
  penaltyOf: (s: string) => number,
  faint: readonly { ref: RefLine; weight: number }[],
): { ref: RefLine; probability: number } | null {
  let total = 1;
  let best: { ref: RefLine; weight: number } | null = null;
  for (const f of faint) {
    total += f.weight;
    if (best === null || f.weight > best.weight) best = f;
  }
  for (const e of evidence) {
    const p = prepared.get(e.species);
    if (!p) continue;
    // A species outside the answer is weighed as if present: then its strongest line in range is
    // the one most sure to show (its detection limit, profiled on the session alone, may have
    // judged even that line weak when one match could not pay for it, as for a broad band).
    const strongest = chosen.has(e.species) ? Number.POSITIVE_INFINITY : maxIntensity(p.refs);
    let top: { ref: RefLine; gain: number } | null = null;
    for (const k of p.touched) {
      const r = p.refs[k] as RefLine;
      const sigma = pairSigma(point.sigma_nm, r.unc_nm, ctx.fwhm_nm);
      const d = point.vacuum_nm - r.vacuum_nm;
      if (Math.abs(d) > WINDOW_SIGMAS * sigma) continue;
      const q = r.intensity >= strongest ? Math.max(p.q[k] as number, Q_STRONG) : (p.q[k] as number);
      const g = matchGain(d, sigma, q, ctx.background_per_nm);
      if (top === null || g > top.gain) top = { ref: r, gain: g };
    }
    if (!top) continue;
    // A species already in the answer pays no prior again for one more line.
    const w = Math.exp(Math.min(50, top.gain - (chosen.has(e.species) ? 0 : penaltyOf(e.species))));
    total += w;
    if (best === null || w > best.weight) best = { ref: top.ref, weight: w };
  }
  return best ? { ref: best.ref, probability: best.weight / total } : null;
}

function maxIntensity(refs: readonly RefLine[]): number {
  let max = Number.NEGATIVE_INFINITY;
  for (const r of refs) if (r.intensity > max) max = r.intensity;
  return max;
}

/** Where lines were expected: the instrument's range (rest frame, vacuum) or the measured span padded. */
function expectedRange(
  reduction: Reduction,
  sorted: MeasuredLine[],
  z: number,
  fwhm: number,
): [number, number] {
  const given = reduction.session.instrument.range_nm;
  if (given) {
    const toVac = (x: number) => (reduction.medium === 'air' ? airToVacuum(x) : x);
    return [toVac(given[0]) / (1 + z), toVac(given[1]) / (1 + z)];
  }
  const lo = sorted[0]?.rest_vacuum_nm ?? 400;
  const hi = sorted.at(-1)?.rest_vacuum_nm ?? 700;
  const pad = Math.max(10, 0.05 * (hi - lo), 5 * fwhm);
  return [Math.max(1, lo - pad), hi + pad];
}

function alternativesFor(
  point: MeasuredPoint,
  chosen: RefLine | null,
  prepared: ReadonlyMap<string, PreparedSpecies>,
  evidence: readonly SpeciesEvidence[],
  fwhm: number,
) {
  const out: { species: string; ref_vacuum_nm: number; residual_nm: number; pull: number }[] = [];
  for (const e of evidence.slice(0, 12)) {
    if (e.score <= 0 && e.confidence < 0.01) continue;
    const p = prepared.get(e.species);
    if (!p) continue;
    for (const r of p.refs) {
      if (r === chosen || r.species === chosen?.species) continue;
      const sigma = pairSigma(point.sigma_nm, r.unc_nm, fwhm);
      const d = point.vacuum_nm - r.vacuum_nm;
      if (Math.abs(d) <= WINDOW_SIGMAS * sigma)
        out.push({
          species: r.species,
          ref_vacuum_nm: r.vacuum_nm,
          residual_nm: d,
          pull: Math.abs(d) / sigma,
        });
    }
  }
  return out
    .sort((a, b) => a.pull - b.pull || a.species.localeCompare(b.species))
    .slice(0, 3)
    .map(({ pull: _pull, ...rest }) => rest);
}

/** For each rival species, its strongest line in range that is far from every line of the chosen set. */
function findDiscriminators(
  chosen: readonly string[],
  contenders: readonly { species: string[] }[],
  prepared: ReadonlyMap<string, PreparedSpecies>,
  catalog: Catalog,
  range: [number, number],
  fwhm: number,
  measured: readonly MeasuredPoint[],
): Explanation['discriminators'] {
  const out: Explanation['discriminators'] = [];
  const involved = new Set<string>();
  for (const c of contenders) for (const s of c.species) involved.add(s);
  for (const s of chosen) involved.add(s);
  const seen = new Set<string>();
  for (const c of contenders) {
    const rivals = c.species.filter((s) => !chosen.includes(s));
    const ours = chosen.filter((s) => !c.species.includes(s));
    for (const [who, against] of [
      ...rivals.map((r) => [r, ours.join(', ') || 'the chosen set'] as const),
      ...ours.map((o) => [o, rivals.join(', ') || 'fewer species'] as const),
    ]) {
      if (seen.has(who)) continue;
      seen.add(who);
      const others = [...involved].filter((s) => s !== who).flatMap((s) => prepared.get(s)?.refs ?? []);
      const mine = [...(prepared.get(who)?.refs ?? [])].sort((a, b) => b.intensity - a.intensity);
      const line = mine.find(
        (r) =>
          r.vacuum_nm >= range[0] &&
          r.vacuum_nm <= range[1] &&
          others.every((o) => Math.abs(o.vacuum_nm - r.vacuum_nm) > 2 * fwhm) &&
          // A line already measured settles nothing new: look for one that was not.
          measured.every(
            (p) =>
              Math.abs(p.vacuum_nm - r.vacuum_nm) > WINDOW_SIGMAS * pairSigma(p.sigma_nm, r.unc_nm, fwhm),
          ),
      );
      if (line && catalog.species.has(who)) {
        out.push({ species: who, vacuum_nm: line.vacuum_nm, air_nm: vacuumToAir(line.vacuum_nm), against });
      }
    }
  }
  return out.slice(0, 4);
}
