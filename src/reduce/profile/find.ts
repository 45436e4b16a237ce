/**
 * Lines found in a profile, pure: continuum and noise from the data (continuum.ts), candidate
 * positions from the smoothed profile and its second derivative, then a least-squares Gaussian
 * fit of each group of overlapping candidates (gaussFit.ts) whose covariance gives every centre
 * its σ. Candidates that the fit cannot tell apart, or whose amplitude is not significant at
 * the threshold, are merged or dropped and the group is fitted again.
 *
 * Smoothing and derivatives use ml-savitzky-golay-generalized (mljs): a maintained
 * Savitzky–Golay filter that takes uneven x, which is what a calibrated wavelength axis has.
 * A minimum of the second derivative marks a line even on the shoulder of a brighter one,
 * which is how blends are split where the data allow (the basis of global spectral
 * deconvolution, as in mljs' ml-gsd; its own fit returns no covariance, so it is not used).
 */
import { sgg } from 'ml-savitzky-golay-generalized';
import { FWHM_PER_SIGMA } from '../../constants.js';
import type { ProfileData } from '../../session/profile/types.js';
import type { LineKind } from '../../session/types.js';
import { estimateContinuum, median } from './continuum.js';
import { fitGaussians, type GaussFit } from './gaussFit.js';

export interface FoundLine {
  /** Centre on the profile's axis (px, or nm) and its 1σ uncertainty. */
  centre: number;
  centre_sigma: number;
  fwhm: number;
  /** Peak height above the continuum (emission, intensity units) or depth as a fraction of it (absorption). */
  amplitude: number;
  amplitude_sigma: number;
  /** Area relative to the strongest line found (emission) or depth (absorption), 0–1. */
  relative: number;
  /** Amplitude over the noise of one point. */
  snr: number;
  /** Found by the finder, or asked for in profile.add. */
  origin: 'found' | 'added';
}

export interface ProfileFinding {
  kind: LineKind;
  lines: FoundLine[];
  /** Continuum at each profile point (intensity units). */
  continuum: number[];
  /** Noise of one point off the lines, in the units the threshold is in. */
  noise: number;
  threshold_sigma: number;
  /** The detection level: above the continuum (emission, intensity units) or below it (absorption, as a fraction). */
  threshold: number;
  /** Typical FWHM of the strong lines, axis units, used to size the filters and fit windows. */
  fwhm_estimate: number;
  /** Lines removed because profile.drop named them, and drop positions that matched none. */
  dropped: FoundLine[];
  unmatched_drops: number[];
}

export interface FindOptions {
  kind: LineKind;
  threshold_sigma: number;
  /** Axis positions of lines to fit even if not found. */
  add: readonly number[];
  /** Axis positions of found lines to leave out. */
  drop: readonly number[];
}

/**
 * A fitted line is kept when its amplitude is this share of the threshold in its own σ: the
 * amplitude itself must still reach the threshold in noise units, and a blend's amplitudes
 * are correlated, which widens their σ.
 */
const SIGNIFICANCE = 0.7;

/** The most lines fitted together as one blend. */
const MAX_GROUP = 8;

const odd = (n: number) => (n % 2 === 1 ? n : n + 1);

/**
 * The FWHM in points of the strongest clear lines, each walked down to half height; maxima
 * below a tenth of the strongest, or inside a line already measured, are not counted.
 */
function typicalFwhmPoints(r: readonly number[], level: number): number {
  const peaks: number[] = [];
  for (let i = 1; i < r.length - 1; i++)
    if (r[i]! > level && r[i]! >= r[i - 1]! && r[i]! > r[i + 1]!) peaks.push(i);
  peaks.sort((a, b) => r[b]! - r[a]!);
  const top = peaks.length ? r[peaks[0]!]! : 0;
  const widths: number[] = [];
  const seen: [number, number][] = [];
  for (const i of peaks) {
    if (widths.length >= 7 || r[i]! < 0.1 * top) break;
    if (seen.some(([a, b]) => i >= a && i <= b)) continue;
    const half = r[i]! / 2;
    let lo = i;
    while (lo > 0 && r[lo]! > half) lo--;
    let hi = i;
    while (hi < r.length - 1 && r[hi]! > half) hi++;
    seen.push([lo, hi]);
    // Linear interpolation between the points either side of each half-height crossing.
    const left = lo + (half - r[lo]!) / (r[lo + 1]! - r[lo]! || 1);
    const right = hi - (half - r[hi]!) / (r[hi - 1]! - r[hi]! || 1);
    widths.push(Math.max(1, right - left));
  }
  return widths.length ? median(widths) : 3;
}

function indexOf(x: readonly number[], v: number): number {
  let lo = 0;
  let hi = x.length - 1;
  if (v <= x[0]!) return 0;
  if (v >= x[hi]!) return hi;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (x[mid]! <= v) lo = mid;
    else hi = mid;
  }
  return lo + (v - x[lo]!) / (x[hi]! - x[lo]!);
}

/**
 * The strongest stretch of the fit's residual, as an index into the window, when it stands
 * `k` σ out by the noise model (sum of residuals over its √(sum of variances)) and its mean
 * reaches the detection threshold; −1 when none does.
 */
function residualPeak(
  y: readonly number[],
  model: readonly number[],
  weight: readonly number[],
  fwhmPoints: number,
  k: number,
  threshold: number,
): number {
  const half = Math.max(1, Math.round(fwhmPoints / 2));
  let best = -1;
  let bestZ = k;
  for (let i = half; i + half < y.length; i++) {
    let sum = 0;
    let variance = 0;
    for (let j = i - half; j <= i + half; j++) {
      sum += y[j]! - model[j]!;
      variance += 1 / weight[j]!;
    }
    const z = sum / Math.sqrt(variance);
    if (z > bestZ && sum / (2 * half + 1) > 0.5 * threshold) {
      bestZ = z;
      best = i;
    }
  }
  return best;
}

interface Candidate {
  index: number;
  added: boolean;
}

export function findLines(data: ProfileData, options: FindOptions): ProfileFinding {
  const { x, intensity: y } = data;
  const n = x.length;
  const sign = options.kind === 'emission' ? 1 : -1;
  // A wide window first, to see the lines; then one of ~12 line widths (common practice).
  const first = estimateContinuum(y, sign, odd(Math.max(31, Math.floor(n / 16))));
  const r0 = y.map((v, i) => sign * (v - first.level[i]!));
  const fwhmPts0 = Math.min(typicalFwhmPoints(r0, 10 * first.noise), Math.max(3, n / 20));
  const cont = estimateContinuum(
    y,
    sign,
    odd(Math.min(Math.max(31, Math.round(12 * fwhmPts0)), Math.max(31, Math.floor(n / 4)))),
  );
  const c = cont.level;
  // Absorption is measured as a depth below the continuum (the normalised profile 1 − y/c).
  const absorb = options.kind === 'absorption';
  const r = y.map((v, i) => (absorb ? (c[i]! - v) / c[i]! : v - c[i]!));
  const pointSigma = data.sigma ? data.sigma.map((s, i) => (absorb ? s / Math.abs(c[i]!) : s)) : null;
  const noise = absorb ? cont.noise / Math.abs(median(c)) : cont.noise;
  const ws = odd(Math.max(5, Math.round(0.7 * fwhmPts0)));
  const wd = odd(Math.max(5, Math.round(fwhmPts0)));
  // An evenly spaced axis takes the filter's fast path (one set of coefficients for all points).
  const dx = (x[n - 1]! - x[0]!) / (n - 1);
  const even = x.every((v, i) => Math.abs(v - (x[0]! + i * dx)) <= 1e-6 * Math.abs(dx));
  const xs = even ? dx : (x as number[]);
  const smooth = sgg(r, xs, { windowSize: ws, polynomial: 2 });
  const d2 = sgg(r, xs, { windowSize: wd, polynomial: 2, derivative: 2 });
  // Off the lines a dark frame can be exactly flat (all zero counts): then the noise is
  // judged on the lines instead, as the scatter about the smoothed profile.
  const onLines = r.filter((_, i) => cont.masked[i]);
  const scatter = onLines.length
    ? 1.4826 * median(r.flatMap((v, i) => (cont.masked[i] ? [Math.abs(v - smooth[i]!)] : [])))
    : 0;
  const floor =
    noise > 0 ? noise : scatter > 0 ? scatter : Math.max(1e-12, Math.max(...r.map(Math.abs)) * 1e-6);
  const threshold = options.threshold_sigma * floor;
  /** The noise off the lines (0 on a dark background), which the weights start from. */
  const background = noise;

  // A curvature minimum counts only when it stands out of the second derivative's own noise
  // (3σ, common practice): on a bright, noisy line top the derivative has many small ones.
  const offLine = d2.filter((_, i) => !cont.masked[i]);
  const d2Noise = 1.4826 * median(Array.from(offLine.length > 8 ? offLine : d2, Math.abs));
  const candidates: Candidate[] = [];
  for (let i = 1; i < n - 1; i++) {
    const curvature = d2[i]! < -3 * d2Noise && d2[i]! <= d2[i - 1]! && d2[i]! < d2[i + 1]!;
    const maximum = smooth[i]! >= smooth[i - 1]! && smooth[i]! > smooth[i + 1]!;
    if ((curvature || maximum) && smooth[i]! > threshold) candidates.push({ index: i, added: false });
  }
  // Candidates closer than half a line width are one (a maximum and the curvature minimum
  // beside it, or noise on one line's top).
  const merged: Candidate[] = [];
  for (const cand of candidates) {
    const last = merged.at(-1);
    if (last && cand.index - last.index <= Math.max(1, 0.5 * fwhmPts0)) {
      if (smooth[cand.index]! > smooth[last.index]!) last.index = cand.index;
    } else merged.push({ ...cand });
  }
  // An added position the finder found anyway is that line, kept whatever its significance.
  for (const a of options.add) {
    const index = Math.round(indexOf(x, a));
    const same = merged.find((m) => Math.abs(m.index - index) <= fwhmPts0);
    if (same) same.added = true;
    else merged.push({ index, added: true });
  }
  merged.sort((a, b) => a.index - b.index);

  const weightsOf = (from: number, to: number, model: number[] | null, gain: number): number[] => {
    const w: number[] = [];
    for (let i = from; i < to; i++) {
      if (pointSigma) w.push(1 / pointSigma[i]! ** 2);
      else {
        // Without uncertainties: the background noise plus a term that grows with the signal
        // (Poisson-like), its gain fitted to the residuals of the first fit.
        if (!model) w.push(1 / (floor * floor));
        else
          w.push(
            1 /
              Math.max(background * background + gain * Math.max(model[i - from]!, 0), 1e-6 * floor * floor),
          );
      }
    }
    return w;
  };

  const lines: FoundLine[] = [];
  const fwhmPts = fwhmPts0;
  const fw = fwhmPts;
  const groups: Candidate[][] = [];
  for (const cand of merged) {
    const g = groups.at(-1);
    // Lines whose fit windows (±2 FWHM) overlap are fitted together, at most MAX_GROUP at
    // once: a longer run is fitted in pieces, each window stopping halfway to the next piece.
    if (g && g.length < MAX_GROUP && cand.index - g.at(-1)!.index < 4 * fw + 5) g.push(cand);
    else groups.push([cand]);
  }
  const bounds = groups.map((g, k) => [
    k > 0 ? Math.ceil((groups[k - 1]!.at(-1)!.index + g[0]!.index) / 2) : 0,
    k + 1 < groups.length ? Math.floor((g.at(-1)!.index + groups[k + 1]![0]!.index) / 2) + 1 : n,
  ]);
  /** The fit window of a group (clipped to its bounds) and the fit's start, or null when too short. */
  const windowOf = (group: Candidate[], lowest: number, highest: number) => {
    const from = Math.max(lowest, Math.floor(group[0]!.index - 2 * fw - 2));
    const to = Math.min(highest, Math.ceil(group.at(-1)!.index + 2 * fw + 3));
    if (to - from < 3 * group.length + 2) return null;
    const ys = r.slice(from, to);
    const step = (x[to - 1]! - x[from]!) / (to - from - 1);
    const s0 = (fw * step) / FWHM_PER_SIGMA;
    const base = {
      x: x.slice(from, to),
      y: ys,
      start: {
        offset: 0,
        components: group.map((g) => ({
          amplitude: Math.max(smooth[g.index]!, floor),
          centre: x[g.index]!,
          width: s0,
        })),
      },
      centreRange: [x[from]!, x[to - 1]!] as [number, number],
      widthRange: [Math.max(0.25 * s0, 0.3 * step), 4 * s0] as [number, number],
      // Each point is taken as the mean over its pixel (a bin of the local step).
      binWidth: step,
    };
    return { from, to, ys, s0, base };
  };
  // Without given uncertainties, the noise grows with the signal (Poisson-like): one gain for
  // the whole profile, fitted to the residuals of a first, equally weighted fit of every
  // group (one profile's worth of residuals; a gain per group would be too noisy).
  let gain = 0;
  if (!pointSigma) {
    let num = 0;
    let den = 0;
    for (const [gi, group] of groups.entries()) {
      const win = windowOf(group, bounds[gi]![0]!, bounds[gi]![1]!);
      const fit = win ? fitGaussians({ ...win.base, weight: weightsOf(win.from, win.to, null, 0) }) : null;
      if (!win || !fit) continue;
      fit.model.forEach((m, k) => {
        const signal = Math.max(m - fit.offset, 0);
        num += ((win.ys[k]! - m) ** 2 / (1 - fit.leverage[k]!) - background * background) * signal;
        den += signal * signal;
      });
    }
    gain = den > 0 ? Math.max(0, num / den) : 0;
  }
  let pooledChi2 = 0;
  let pooledDof = 0;
  const unscaled: FoundLine[] = [];
  for (let [gi, group] of groups.entries()) {
    const [lowest, highest] = bounds[gi]!;
    // Positions the residual search already tried (so a rejected one is not tried again).
    const tried: number[] = [];
    for (let round = 0; round < 40 && group.length > 0; round++) {
      const win = windowOf(group, lowest!, highest!);
      if (!win) break;
      const { from, to, ys, s0, base } = win;
      let weight = weightsOf(from, to, null, 0);
      let fit: GaussFit | null = fitGaussians({ ...base, weight });
      if (fit && !pointSigma) {
        const model = fit.model.map((m) => m - fit!.offset);
        const second = weightsOf(from, to, model, gain);
        const refit = fitGaussians({
          ...base,
          start: { offset: fit.offset, components: fit.components },
          weight: second,
        });
        if (refit) {
          fit = refit;
          weight = second;
        }
      }
      if (!fit) break;
      // Decisions take the group's own χ²/ν when it is worse than the noise model says.
      const scale = pointSigma || fit.dof <= 0 ? 1 : Math.max(1, fit.chi2 / fit.dof);
      const comps = fit.components.map((cmp, k) => ({
        ...cmp,
        centre_sigma: Math.sqrt(fit!.covariance[2 + 3 * k]![2 + 3 * k]!),
        amplitude_sigma: Math.sqrt(fit!.covariance[1 + 3 * k]![1 + 3 * k]! * scale),
        added: group[k]!.added,
      }));
      // Weakest insignificant component, or the fainter of two the fit cannot tell apart.
      let remove = -1;
      let worst = Number.POSITIVE_INFINITY;
      comps.forEach((cmp, k) => {
        const significance = cmp.amplitude / cmp.amplitude_sigma;
        if (
          !cmp.added &&
          (!(significance >= SIGNIFICANCE * options.threshold_sigma) || cmp.amplitude < threshold) &&
          significance < worst
        ) {
          worst = significance;
          remove = k;
        }
      });
      if (remove < 0) {
        for (let k = 0; k + 1 < comps.length && remove < 0; k++) {
          const a = comps[k]!;
          const b = comps[k + 1]!;
          const apart = Math.abs(a.centre - b.centre);
          if (apart < 0.5 * FWHM_PER_SIGMA * Math.max(a.width, b.width))
            remove = a.amplitude < b.amplitude && !a.added ? k : k + 1;
        }
      }
      if (remove >= 0) {
        group = group.filter((_, k) => k !== remove);
        continue;
      }
      // A faint line on a brighter one's shoulder can hide from the second derivative (the
      // bright line's curvature is positive there): look for it in what the fit leaves,
      // each stretch of about a FWHM weighed against the noise model, and fit again with it.
      const extra =
        group.length < MAX_GROUP
          ? residualPeak(ys, fit.model, weight, fw, options.threshold_sigma, threshold)
          : -1;
      if (extra >= 0) {
        const index = from + extra;
        const near = (i: number) => Math.abs(i - index) < 0.5 * fw;
        if (!tried.some(near) && !group.some((g) => near(g.index))) {
          tried.push(index);
          group = [...group, { index, added: false }].sort((a, b) => a.index - b.index);
          continue;
        }
      }
      // A line fitted much wider than the typical one may be two: split it, and keep the two
      // when χ² falls by more than threshold² (a likelihood-ratio test at the threshold, common
      // practice) and the next round finds both significant.
      if (group.length < MAX_GROUP) {
        const wide = comps
          .map((c, k) => ({ c, k }))
          .filter(
            ({ c }) =>
              c.width > 1.25 * s0 &&
              !tried.some((t) => Math.abs(x[Math.round(t)]! - c.centre) < 0.25 * FWHM_PER_SIGMA * s0),
          )
          .sort((a, b) => b.c.width - a.c.width)[0];
        if (wide) {
          const index = Math.round(indexOf(x, wide.c.centre));
          tried.push(index);
          const d = 0.6 * wide.c.width;
          const pair = [
            { amplitude: wide.c.amplitude, centre: wide.c.centre - d, width: s0 },
            { amplitude: wide.c.amplitude, centre: wide.c.centre + d, width: s0 },
          ];
          const others = fit.components.filter((_, k) => k !== wide.k);
          const split = fitGaussians({
            ...base,
            start: { offset: fit.offset, components: [...others, ...pair] },
            weight,
          });
          if (split && fit.chi2 - split.chi2 > options.threshold_sigma ** 2) {
            const [a, b] = split.components.slice(-2).map((c) => Math.round(indexOf(x, c.centre)));
            if (a !== undefined && b !== undefined && a !== b) {
              const kept = group.filter((_, k) => k !== wide.k);
              const pairIndex = [a, b].map((i) => ({ index: i, added: group[wide.k]!.added }));
              group = [...kept, ...pairIndex].sort((p, q) => p.index - q.index);
              tried.push(a, b);
              continue;
            }
          }
        }
      }
      pooledChi2 += fit.chi2;
      pooledDof += fit.dof;
      for (const cmp of comps)
        unscaled.push({
          centre: cmp.centre,
          centre_sigma: cmp.centre_sigma,
          fwhm: FWHM_PER_SIGMA * cmp.width,
          amplitude: cmp.amplitude,
          amplitude_sigma: cmp.amplitude_sigma,
          relative: cmp.amplitude * cmp.width,
          snr: cmp.amplitude / floor,
          origin: cmp.added ? 'added' : 'found',
        });
      break;
    }
  }
  // The reported σ: the covariance of the noise model, scaled by χ²/ν pooled over all fits
  // (one scale for the profile, so no line's σ rests on a dozen points' χ² alone).
  // A χ²/ν below 1 is taken as 1: the fit is not allowed to claim less noise than its model.
  const pooled = pointSigma || pooledDof <= 0 ? 1 : Math.sqrt(Math.max(1, pooledChi2 / pooledDof));
  for (const l of unscaled) lines.push({ ...l, centre_sigma: l.centre_sigma * pooled });
  lines.sort((a, b) => a.centre - b.centre);
  const strongest = Math.max(...lines.map((l) => l.relative), 0);
  for (const l of lines) l.relative = absorb ? l.amplitude : strongest > 0 ? l.relative / strongest : 0;

  const dropped: FoundLine[] = [];
  const unmatched: number[] = [];
  for (const d of options.drop) {
    let best = -1;
    for (let k = 0; k < lines.length; k++)
      if (best < 0 || Math.abs(lines[k]!.centre - d) < Math.abs(lines[best]!.centre - d)) best = k;
    if (best >= 0 && Math.abs(lines[best]!.centre - d) <= lines[best]!.fwhm)
      dropped.push(...lines.splice(best, 1));
    else unmatched.push(d);
  }
  return {
    kind: options.kind,
    lines,
    continuum: c,
    noise: floor,
    threshold_sigma: options.threshold_sigma,
    threshold,
    fwhm_estimate: fwhmPts * ((x[n - 1]! - x[0]!) / (n - 1)),
    dropped,
    unmatched_drops: unmatched,
  };
}
