/**
 * Part 2 of bench:profile: lamp profiles on a wavelength axis through the whole pipeline,
 * compared with typing the same lines with the same σ. The lamps' lines and relative
 * intensities are the bundled catalog's (NIST ASD rows); the instrument is invented.
 */
import type { Writable } from 'node:stream';
import type { Catalog } from '../src/lines/types.js';
import { runSession } from '../src/pipeline.js';
import { vacuumToAir } from '../src/reduce/airVacuum.js';
import { expectedCounts, poissonProfile } from '../test/helpers/profile.js';
import { gaussianDeviate, mulberry32 } from '../test/helpers/random.js';
import { visibleLines } from './synthetic.js';

const LAMPS = ['He I', 'Ne I', 'Ar I', 'Hg I', 'Kr I', 'Xe I', 'H I', 'Na I'];
const FROM_NM = 395;
const STEP_NM = 0.1;
const POINTS = 3101;
export interface Scenario {
  label: string;
  /** Peak SNR of the brightest line over a 100-count background. */
  peakSnr: number;
  sigmaPx: number;
}

export const SCENARIOS: Scenario[] = [
  { label: 'bright, sharp (peak SNR 300, FWHM 0.52 nm)', peakSnr: 300, sigmaPx: 2.2 },
  { label: 'faint, blurred (peak SNR 40, FWHM 1.4 nm)', peakSnr: 40, sigmaPx: 6 },
];

export function pipelineOf(catalog: Catalog, seed: number, out: Writable, trials = 60): void {
  for (const scenario of SCENARIOS) scenarioOf(catalog, seed, out, trials, scenario);
}

function scenarioOf(catalog: Catalog, seed: number, out: Writable, trials: number, scenario: Scenario): void {
  const SIGMA_PX = scenario.sigmaPx;
  const rand = mulberry32(seed + 1);
  const lamps = LAMPS.filter((s) => visibleLines(catalog, s, [400, 700], 'air', 0).length >= 4);
  let profileRight = 0;
  let typedRight = 0;
  let profileLines = 0;
  let typedLines = 0;
  let profileIdentified = 0;
  let typedIdentified = 0;
  for (let k = 0; k < trials; k++) {
    const species = lamps[k % lamps.length]!;
    const lines = visibleLines(
      catalog,
      species,
      [FROM_NM + 2, FROM_NM + STEP_NM * (POINTS - 1) - 2],
      'air',
      0,
    ).slice(0, 15);
    const top = lines[0]!.intensity;
    const peak = scenario.peakSnr * 10; // the brightest line's peak over a 100-count background (σ 10)
    const truth = lines.map((l) => {
      const air = vacuumToAir(l.vacuum_nm);
      return {
        air,
        centre_px: (air - FROM_NM) / STEP_NM,
        photons: peak * (l.intensity / top) * SIGMA_PX * Math.sqrt(2 * Math.PI),
        sigma_px: SIGMA_PX,
      };
    });
    const y = poissonProfile(expectedCounts(POINTS, truth, 100), Math.floor(rand() * 2 ** 31));
    const csv = `wavelength,counts\n${y.map((v, i) => `${(FROM_NM + STEP_NM * i).toFixed(2)},${v}`).join('\n')}\n`;
    const head = `lineledger: 1\nsource: { kind: lamp, class: discharge-tube }\nmedium: air\ninstrument: { resolution_nm: ${(2.3548 * SIGMA_PX * STEP_NM).toFixed(3)}, range_nm: [${FROM_NM}, ${FROM_NM + STEP_NM * (POINTS - 1)}] }\nmeasurement: { method: wavelength, unit: nm }\n`;
    const found = runSession('p.yaml', `${head}profile: { file: p.csv }\n`, catalog, {
      profile: { name: 'p.csv', bytes: new TextEncoder().encode(csv) },
    });
    if (!found.ok) continue;
    if (found.identification.explanation.species.join() === species) profileRight++;
    profileLines += found.reduction.lines.length;
    profileIdentified += found.identification.lines.filter((l) => l.status === 'identified').length;
    // The same lines typed, each at its true wavelength plus noise of the σ the finder gave it.
    const typed = found.reduction.lines.map((l) => {
      const nearest = truth.reduce((a, b) =>
        Math.abs(b.air - l.air_nm) < Math.abs(a.air - l.air_nm) ? b : a,
      );
      const centre = Math.abs(nearest.air - l.air_nm) < 0.2 ? nearest.air : l.air_nm;
      const sigma = Math.max(l.sigma_nm, 1e-4);
      return `  - { wavelength: ${(centre + sigma * gaussianDeviate(rand)).toFixed(5)}, sigma: ${sigma.toPrecision(3)}, intensity: ${l.intensity ?? 1} }`;
    });
    const byHand = runSession('t.yaml', `${head}lines:\n${typed.join('\n')}\n`, catalog);
    if (!byHand.ok) continue;
    if (byHand.identification.explanation.species.join() === species) typedRight++;
    typedLines += byHand.reduction.lines.length;
    typedIdentified += byHand.identification.lines.filter((l) => l.status === 'identified').length;
  }
  const pct = (a: number, b: number) => `${((100 * a) / Math.max(1, b)).toFixed(1)} %`;
  out.write(`End to end, ${scenario.label} (${trials} lamp profiles: ${lamps.join(', ')})\n`);
  out.write(
    `  right species from the profile: ${profileRight}/${trials} = ${pct(profileRight, trials)}; lines identified ${pct(profileIdentified, profileLines)}\n`,
  );
  out.write(
    `  right species from typed lines of the same σ: ${typedRight}/${trials} = ${pct(typedRight, trials)}; lines identified ${pct(typedIdentified, typedLines)}\n`,
  );
}
