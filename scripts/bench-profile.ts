/**
 * Profile line-finding benchmark (npm run bench:profile), seeded synthetic camera profiles:
 *   1. detection and centroids: 4096-pixel Poisson profiles, SNR 5–200, FWHM 2–8 px, 3–40
 *      lines, a fifth of them placed 1–1.6 FWHM from another (blends). Reports the share of
 *      lines with SNR ≥ 10 found, the share of found lines that match no true line, and the
 *      centroid scatter in units of the photon-noise limit of a least-squares Gaussian fit
 *      (Thompson, Larson & Webb 2002, Biophys. J. 82:2775, eq. 17; from memory).
 *   2. end to end: lamp profiles on a wavelength axis (lines and relative intensities from the
 *      bundled catalog), bright and sharp or faint and blurred, identified from the found lines
 *      and from the same lines typed at their true wavelengths plus noise of the same σ.
 *   3. speed: one 4096-point profile with 40 lines to lines, median of 30 runs.
 * SNR here is a line's peak height over the background noise of one pixel.
 *   --seed N   seed (default 20261202)   --n N   profiles in part 1 (default 200)
 */
import { writeFileSync } from 'node:fs';
import { loadCatalog } from '../src/lines/load.js';
import { findLines } from '../src/reduce/profile/find.js';
import type { ProfileData } from '../src/session/profile/types.js';
import { expectedCounts, poissonProfile, type SyntheticLine } from '../test/helpers/profile.js';
import { mulberry32 } from '../test/helpers/random.js';
import { numberArg } from './args.js';
import { pipelineOf } from './bench-profile-e2e.js';

const args = process.argv.slice(2);
const arg = (name: string, fallback: number) => numberArg(args, name, fallback);
const SEED = arg('--seed', 20261202);
const N = arg('--n', 200);
const rand = mulberry32(SEED);
const uniform = (a: number, b: number) => a + (b - a) * rand();

const BACKGROUND = 100; // counts per pixel: σ of one pixel is 10
const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);
const n = 4096;
const pixels = Array.from({ length: n }, (_, i) => i);
const asProfile = (y: number[]): ProfileData => ({
  format: 'csv',
  axis: 'pixel',
  x: pixels,
  intensity: y,
  sigma: null,
  medium: null,
  description: 'synthetic',
});

interface Truth extends SyntheticLine {
  snr: number;
  blended: boolean;
}

function drawProfile(): { truth: Truth[]; y: number[]; fwhm: number } {
  const fwhm = uniform(Number(process.env.BENCH_FWHM_MIN ?? 2), Number(process.env.BENCH_FWHM_MAX ?? 8));
  const s = fwhm / FWHM_PER_SIGMA;
  const count = 3 + Math.floor(rand() * 38);
  const truth: Truth[] = [];
  const noise = Math.sqrt(BACKGROUND);
  while (truth.length < count) {
    const snr = Math.exp(uniform(Math.log(5), Math.log(200)));
    const amplitude = snr * noise;
    const photons = amplitude * s * Math.sqrt(2 * Math.PI);
    let centre: number;
    let blended = false;
    if (truth.length > 0 && rand() < 0.2) {
      const other = truth[Math.floor(rand() * truth.length)]!;
      centre = other.centre_px + (rand() < 0.5 ? -1 : 1) * uniform(1, 1.6) * fwhm;
      blended = true;
      other.blended = true;
    } else centre = uniform(20, n - 20);
    if (centre < 20 || centre > n - 20) continue;
    // Keep lines that are not meant as blends at least 3 FWHM from all others.
    if (!blended && truth.some((t) => Math.abs(t.centre_px - centre) < 3 * fwhm)) continue;
    if (blended && truth.some((t) => Math.abs(t.centre_px - centre) < 0.99 * fwhm)) continue;
    truth.push({ centre_px: centre, photons, sigma_px: s, snr, blended });
  }
  const y = poissonProfile(expectedCounts(n, truth, BACKGROUND), Math.floor(rand() * 2 ** 31));
  return { truth, y, fwhm };
}

function partDetection(): void {
  let strong = 0;
  let strongFound = 0;
  let blendStrong = 0;
  let blendFound = 0;
  let found = 0;
  let spurious = 0;
  let split = 0;
  const ratios: number[] = [];
  /** Per SNR band: error / full limit, error / photon term alone, error / reported σ. */
  const bands = [10, 30, 100, 1e9].slice(0, -1).map((lo, b, all) => ({
    lo,
    hi: all[b + 1] ?? 1e9,
    full: [] as number[],
    photon: [] as number[],
    pull: [] as number[],
  }));
  for (let k = 0; k < N; k++) {
    const { truth, y, fwhm } = drawProfile();
    if (process.env.BENCH_DUMP === String(k))
      writeFileSync('/tmp/bench-profile.json', JSON.stringify({ truth, y, fwhm }));
    const lines = findLines(asProfile(y), { kind: 'emission', threshold_sigma: 5, add: [], drop: [] }).lines;
    found += lines.length;
    // One-to-one matching, nearest first, within half a FWHM.
    const pairs: [number, number, number][] = [];
    for (const [i, t] of truth.entries())
      for (const [j, l] of lines.entries()) {
        const d = Math.abs(l.centre - t.centre_px);
        if (d < 0.5 * fwhm) pairs.push([d, i, j]);
      }
    pairs.sort((a, b) => a[0] - b[0]);
    const usedT = new Set<number>();
    const usedL = new Set<number>();
    for (const [, i, j] of pairs) {
      if (usedT.has(i) || usedL.has(j)) continue;
      usedT.add(i);
      usedL.add(j);
      const t = truth[i]!;
      if (t.snr >= 10 && !t.blended) {
        const s2 = t.sigma_px ** 2;
        const limit = Math.sqrt(
          (s2 + 1 / 12) / t.photons + (8 * Math.PI * s2 * s2 * BACKGROUND) / t.photons ** 2,
        );
        const err = lines[j]!.centre - t.centre_px;
        ratios.push(err / limit);
        const band = bands.find((b) => t.snr >= b.lo && t.snr < b.hi);
        band?.full.push(err / limit);
        band?.photon.push(err / Math.sqrt((s2 + 1 / 12) / t.photons));
        band?.pull.push(err / lines[j]!.centre_sigma);
      }
    }
    truth.forEach((t, i) => {
      if (t.snr < 10) return;
      strong++;
      if (usedT.has(i)) strongFound++;
      else if (process.env.BENCH_MISSES) {
        const other = truth
          .filter((o) => o !== t)
          .reduce((a, o) =>
            Math.abs(o.centre_px - t.centre_px) < Math.abs(a.centre_px - t.centre_px) ? o : a,
          );
        process.stderr.write(
          `miss k ${k} c ${t.centre_px.toFixed(1)} snr ${t.snr.toFixed(0)} fwhm ${fwhm.toFixed(1)} blended ${t.blended} sep/fwhm ${(Math.abs(other.centre_px - t.centre_px) / fwhm).toFixed(2)} other ${other.snr.toFixed(0)}\n`,
        );
      }
      if (t.blended) {
        blendStrong++;
        if (usedT.has(i)) blendFound++;
      }
    });
    // A found line that matches no true line: far from all of them (noise), or beside one (a split).
    lines.forEach((l, j) => {
      if (usedL.has(j)) return;
      if (truth.some((t) => Math.abs(t.centre_px - l.centre) < fwhm)) split++;
      else spurious++;
    });
  }
  const rmsOf = (v: readonly number[]) => Math.sqrt(v.reduce((s, r) => s + r * r, 0) / Math.max(1, v.length));
  const rms = rmsOf(ratios);
  /** 1.4826 × median |x|: the scatter without the few fits that went astray. */
  const robust = (v: readonly number[]) =>
    1.4826 * ([...v].map(Math.abs).sort((a, b) => a - b)[Math.floor(v.length / 2)] ?? 0);
  const pct = (a: number, b: number) => `${((100 * a) / Math.max(1, b)).toFixed(1)} %`;
  process.stdout.write(`Detection (${N} profiles of ${n} px, seed ${SEED})\n`);
  process.stdout.write(
    `  lines with SNR ≥ 10 found: ${strongFound}/${strong} = ${pct(strongFound, strong)} (target ≥ 98 %)\n`,
  );
  process.stdout.write(
    `    of them in blends (1–1.6 FWHM apart): ${blendFound}/${blendStrong} = ${pct(blendFound, blendStrong)}\n`,
  );
  process.stdout.write(
    `  false lines: ${spurious + split}/${found} = ${pct(spurious + split, found)} (target ≤ 2 %): ${spurious} far from any true line, ${split} beside one (a line split in two)\n`,
  );
  process.stdout.write(
    `  centroid scatter / photon-noise limit (isolated, SNR ≥ 10, ${ratios.length} lines): ${rms.toFixed(2)} (target ≤ 1.5)\n`,
  );
  // Thompson et al.'s background term is an approximation that overstates the error where it
  // dominates (faint lines); the photon term alone, √((σ² + a²/12)/N), is a floor no fit beats.
  for (const b of bands.filter((x) => x.lo < 200))
    process.stdout.write(
      `    SNR ${b.lo}–${b.hi >= 1e9 ? '200' : b.hi} (${b.full.length} lines): scatter / limit ${rmsOf(b.full).toFixed(2)}, / photon term alone ${rmsOf(b.photon).toFixed(2)}; scatter / reported σ ${rmsOf(b.pull).toFixed(2)} (robust ${robust(b.pull).toFixed(2)})\n`,
    );
}

function partSpeed(): void {
  let profile: number[] = [];
  let truth: Truth[] = [];
  while (truth.length < 40) ({ truth, y: profile } = drawProfile());
  const data = asProfile(profile);
  const times: number[] = [];
  for (let k = 0; k < 35; k++) {
    const t0 = performance.now();
    findLines(data, { kind: 'emission', threshold_sigma: 5, add: [], drop: [] });
    if (k >= 5) times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  process.stdout.write(
    `Speed: ${n}-point profile with ${truth.length} lines → lines in ${times[Math.floor(times.length / 2)]!.toFixed(1)} ms (median of 30; slowest ${times.at(-1)!.toFixed(1)} ms; target ≤ 50 ms)\n`,
  );
}

const loaded = loadCatalog();
if (!loaded.ok) throw new Error('catalog has problems');
partDetection();
pipelineOf(loaded.value, SEED, process.stdout);
partSpeed();
