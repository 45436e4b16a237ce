/**
 * Unknown shift: scan z (or v) over the session's range with a step of one line-σ in z,
 * score the best explanation where the lines could line up, refine by weighted least squares
 * from the matched lines, and warn when a second shift is about as good.
 *
 * Scan: for every measured line i and reference line k of every candidate species, the pair
 * votes for z = λᵢ/λ_k − 1. Grid bins where some species collects at least two votes (one
 * line alone cannot fix a shift) are evaluated with the full identification; elsewhere the
 * evidence is that of chance (score 0). This is the scan restricted to where it can matter,
 * so a scan over [0, 1] stays fast. Rest wavelengths are vacuum: (1 + z) = λ_obs,vac / λ_rest,vac.
 */

import { lowerBound } from '../lines/search.js';
import type { Catalog } from '../lines/types.js';
import { redshiftFromVelocity, restFrame, velocityFromRedshift } from '../reduce/doppler.js';
import type { Reduction } from '../reduce/types.js';
import { candidateSpecies, isTelluric } from './candidates.js';
import { toFaintLine } from './faint.js';
import { calibratedConfidence, statusFor } from './model.js';
import { relabel } from './relabel.js';
import type { Identification, ScanPoint, ShiftFound } from './types.js';

/** How many grid bins get a full identification, at most. */
const MAX_EVALUATED_BINS = 60;
/** A second peak this close (nats) to the best is "about as good". */
const RIVAL_MARGIN_NATS = 2;
/** Cap on grid size, so a huge range with tiny σ cannot stall a build. */
const MAX_BINS = 200_000;

export type CoreIdentify = (reduction: Reduction) => Identification;

/** The reduction with its lines moved to the rest frame of shift z (observed values kept). */
export function reductionAtShift(reduction: Reduction, z: number, z_sigma: number): Reduction {
  return {
    ...reduction,
    // Identification reads the frame from here (range, resolution and telluric lines scale by 1 + z).
    shift: {
      source: 'search',
      z,
      z_sigma,
      velocity_km_s: velocityFromRedshift(z),
      velocity_sigma_km_s: 0,
      barycentric: reduction.shift?.barycentric ?? null,
    },
    lines: reduction.lines.map((l) => {
      const r = restFrame(l.vacuum_nm, l.sigma_nm, z, z_sigma);
      return { ...l, rest_vacuum_nm: r.rest_nm, rest_sigma_nm: r.rest_sigma_nm };
    }),
  };
}

export function searchShift(
  reduction: Reduction,
  catalog: Catalog,
  core: CoreIdentify,
  range: { mode: 'redshift' | 'velocity'; z_from: number; z_to: number },
  /** The best explanation's score at rest (0 when nothing beats chance): what `core` would give. */
  scoreOf: (reduction: Reduction) => number = (r) => explanationScore(core(r)),
): { found: ShiftFound; identification: Identification; reduction: Reduction } | null {
  const lines = reduction.lines;
  if (lines.length === 0) return null;
  const obs = lines.map((l) => l.vacuum_nm);
  const sorted = [...obs].sort((a, b) => a - b);
  const sigmas = lines.map((l) => l.sigma_nm).sort((a, b) => a - b);
  const medianSigma = Math.max(sigmas[Math.floor(sigmas.length / 2)] ?? 0.5, 0.005);
  const medianObs = sorted[Math.floor(sorted.length / 2)] ?? 500;
  const fwhm = reduction.resolution_nm ?? 2.3548 * medianSigma;
  // One σ of a single line, in z (including the instrument's centroiding floor).
  const sigmaZ = Math.hypot(medianSigma, fwhm / 4.71) / medianObs;
  const span = range.z_to - range.z_from;
  const step = Math.max(sigmaZ, span / MAX_BINS);
  const bins = Math.max(1, Math.ceil(span / step));

  const { species } = candidateSpecies(reduction.session, catalog);
  const votes = new Map<number, Map<string, Set<number>>>();
  const lo = (sorted[0] as number) / (1 + range.z_to) - 5;
  const hi = (sorted.at(-1) as number) / (1 + range.z_from) + 5;
  for (const name of species) {
    if (isTelluric(catalog, name)) continue; // telluric lines do not move with the source
    const s = catalog.species.get(name);
    if (!s) continue;
    const start = lowerBound(s.vacuum_nm, lo);
    for (let k = start; k < s.vacuum_nm.length && (s.vacuum_nm[k] as number) <= hi; k++) {
      const ref = s.vacuum_nm[k] as number;
      obs.forEach((o, i) => {
        const z = o / ref - 1;
        if (z < range.z_from - step || z > range.z_to + step) return;
        const centre = Math.round((z - range.z_from) / step);
        for (const b of [centre - 1, centre, centre + 1]) {
          if (b < 0 || b > bins) continue;
          let bySpecies = votes.get(b);
          if (!bySpecies) {
            bySpecies = new Map();
            votes.set(b, bySpecies);
          }
          const set = bySpecies.get(name) ?? new Set<number>();
          set.add(i);
          bySpecies.set(name, set);
        }
      });
    }
  }
  const minVotes = Math.min(2, lines.length);
  const promising = [...votes.entries()]
    .map(([bin, bySpecies]) => ({ bin, count: Math.max(...[...bySpecies.values()].map((v) => v.size)) }))
    .filter((b) => b.count >= minVotes)
    .sort((a, b) => b.count - a.count || a.bin - b.bin)
    .slice(0, MAX_EVALUATED_BINS);

  const scan: ScanPoint[] = [];
  let best: { z: number; score: number } | null = null;
  // Each bin needs only the best explanation's score; the full identification (line by line)
  // is made once, at the best bin.
  const evaluate = (z: number) => ({ z, score: scoreOf(reductionAtShift(reduction, z, 0)) });
  for (const { bin } of promising) {
    const z = range.z_from + bin * step;
    const result = evaluate(z);
    scan.push({ z, velocity_km_s: velocityFromRedshift(z), score: result.score });
    if (best === null || result.score > best.score) best = result;
  }
  if (best === null) {
    const result = evaluate(Math.max(range.z_from, Math.min(range.z_to, 0)));
    best = result;
    scan.push({ z: result.z, velocity_km_s: velocityFromRedshift(result.z), score: result.score });
  }

  // Refine: z from the matched lines by weighted least squares, re-identify, twice.
  let z = best.z;
  let zSigma = sigmaZ;
  let idn = core(reductionAtShift(reduction, best.z, 0));
  let used = 0;
  for (let pass = 0; pass < 3; pass++) {
    const fit = fitShift(reduction, idn, catalog);
    if (fit === null) break;
    z = fit.z;
    zSigma = fit.z_sigma;
    used = fit.used;
    idn = core(reductionAtShift(reduction, z, zSigma));
  }
  const score = explanationScore(idn);
  scan.push({ z, velocity_km_s: velocityFromRedshift(z), score });
  scan.sort((a, b) => a.z - b.z);

  const separation = Math.max(3 * step, 5 * zSigma);
  const rival = scan
    .filter((p) => Math.abs(p.z - z) > separation)
    .sort((a, b) => b.score - a.score || a.z - b.z)[0];
  const runnerUp =
    rival && rival.score > 0 ? { z: rival.z, velocity_km_s: rival.velocity_km_s, score: rival.score } : null;
  const warning =
    runnerUp && score - runnerUp.score < RIVAL_MARGIN_NATS
      ? `a second shift, z = ${runnerUp.z.toFixed(4)} (v = ${runnerUp.velocity_km_s.toFixed(0)} km/s), explains the lines about as well (${(score - runnerUp.score).toFixed(1)} nats apart): measure more lines to decide`
      : used < 2
        ? 'the shift rests on fewer than two matched lines and is not reliable'
        : null;

  const bary = reduction.shift?.barycentric ?? null;
  const v = velocityFromRedshift(z);
  const dvdz = (velocityFromRedshift(z + 1e-7) - velocityFromRedshift(z - 1e-7)) / 2e-7;
  const zBary = bary ? (1 + z) / (1 + redshiftFromVelocity(-bary.correction_km_s)) - 1 : null;
  const shifted = reductionAtShift(reduction, z, zSigma);
  const found: ShiftFound = {
    mode: range.mode,
    z,
    z_sigma: zSigma,
    velocity_km_s: v,
    velocity_sigma_km_s: Math.abs(dvdz) * zSigma,
    lines_used: used,
    score,
    step_z: step,
    scan,
    runner_up: runnerUp,
    warning,
    barycentric_velocity_km_s: zBary === null ? null : velocityFromRedshift(zBary),
    barycentric_z: zBary,
  };
  // The explanation's confidence also carries the doubt about which shift is right.
  const peaks = distinctPeaks(scan, z, separation);
  const total = peaks.reduce((acc, p) => acc + Math.exp(p - score), 1);
  const e = idn.explanation;
  e.raw_confidence /= total;
  e.confidence = calibratedConfidence(e.raw_confidence);
  e.status = statusFor(e.species, e.confidence);
  relabel(idn, reduction.medium);
  return { found, identification: { ...idn, shift: found }, reduction: shifted };
}

function explanationScore(idn: Identification): number {
  return idn.explanation.species.length === 0 ? 0 : idn.explanation.score;
}

/** Scores of the best point of every other peak (points farther than `separation` apart). */
function distinctPeaks(scan: readonly ScanPoint[], bestZ: number, separation: number): number[] {
  const others = scan.filter((p) => Math.abs(p.z - bestZ) > separation).sort((a, b) => b.score - a.score);
  const peaks: ScanPoint[] = [];
  for (const p of others) if (peaks.every((q) => Math.abs(q.z - p.z) > separation)) peaks.push(p);
  return peaks.slice(0, 5).map((p) => p.score);
}

/**
 * Weighted mean of zᵢ = λᵢ,obs / λ_k,rest − 1 over the matched, non-telluric lines, with
 * σ(zᵢ) = √(σᵢ² + u_k²)/λ_k; σ_z = 1/√Σw, scaled by √(χ²/dof) when the scatter exceeds the σs.
 */
function fitShift(
  reduction: Reduction,
  idn: Identification,
  catalog: Catalog,
): { z: number; z_sigma: number; used: number } | null {
  const byIndex = new Map(reduction.lines.map((l) => [l.index, l]));
  const pts: { z: number; w: number }[] = [];
  for (const a of idn.lines) {
    const asg = a.assignment;
    if (!asg || isTelluric(catalog, asg.species) || toFaintLine(asg)) continue;
    const line = byIndex.get(a.index);
    if (!line) continue;
    const zi = line.vacuum_nm / asg.ref_vacuum_nm - 1;
    const s = Math.max(line.sigma_nm, 1e-4) / asg.ref_vacuum_nm;
    pts.push({ z: zi, w: 1 / (s * s) });
  }
  if (pts.length === 0) return null;
  const wsum = pts.reduce((a, p) => a + p.w, 0);
  const z = pts.reduce((a, p) => a + p.w * p.z, 0) / wsum;
  let sigma = Math.sqrt(1 / wsum);
  if (pts.length > 1) {
    const chi2 = pts.reduce((a, p) => a + p.w * (p.z - z) ** 2, 0) / (pts.length - 1);
    if (chi2 > 1) sigma *= Math.sqrt(chi2);
  }
  return { z, z_sigma: sigma, used: pts.length };
}
