/**
 * Synthetic sessions drawn from the bundled catalog with a fixed seed, for the identification
 * benchmark. Invented measurements only; the reference lines they are drawn from are the
 * catalog's. Each session knows its truth (species, and z when shifted).
 */

import { windowRange } from '../src/lines/search.js';
import type { Catalog } from '../src/lines/types.js';
import { airToVacuum, vacuumToAir } from '../src/reduce/airVacuum.js';
import { gaussianDeviate, mulberry32 } from '../test/helpers/random.js';

export const rng = mulberry32;
export const gauss = gaussianDeviate;

export interface SyntheticSession {
  yaml: string;
  truth: string[];
  z: number | null;
  lineCount: number;
}

export interface SyntheticOptions {
  species: string[];
  sigma_nm: number;
  /** Observed range, nm, in the session's medium. */
  range_nm: [number, number];
  medium: 'air' | 'vacuum';
  sourceKind: string;
  z: number | null;
  searchRange: [number, number] | null;
  spuriousMean: number;
  groups: string[];
}

/** Lines of a species whose observed wavelength falls in the range, strongest first. */
export function visibleLines(
  catalog: Catalog,
  species: string,
  range: [number, number],
  medium: 'air' | 'vacuum',
  z: number,
) {
  const lines = catalog.species.get(species);
  if (!lines) return [];
  const toVac = (x: number) => (medium === 'air' ? airToVacuum(x) : x);
  const [a, b] = windowRange(lines.vacuum_nm, toVac(range[0]) / (1 + z), toVac(range[1]) / (1 + z));
  const out: { vacuum_nm: number; intensity: number }[] = [];
  for (let k = a; k < b; k++)
    out.push({ vacuum_nm: lines.vacuum_nm[k] as number, intensity: lines.intensity[k] as number });
  return out.sort((x, y) => y.intensity - x.intensity);
}

function poisson(rand: () => number, mean: number): number {
  const limit = Math.exp(-mean);
  let k = 0;
  let p = rand();
  while (p > limit) {
    k++;
    p *= rand();
  }
  return k;
}

export function makeSession(
  catalog: Catalog,
  rand: () => number,
  o: SyntheticOptions,
): SyntheticSession | null {
  const z = o.z ?? 0;
  const rows: { wavelength: number; intensity: number }[] = [];
  const fwhm = Math.max(0.5, 2 * o.sigma_nm);
  for (const s of o.species) {
    const visible = visibleLines(catalog, s, o.range_nm, o.medium, z);
    // A species must show at least two lines the instrument can separate, else no
    // measurement could tell it is there (a single blend is one line).
    const k0 = Math.min(visible.length, 3 + Math.floor(rand() * 8));
    const seen = visible
      .slice(0, k0)
      .map((l) => l.vacuum_nm * (1 + z))
      .sort((a, b) => a - b);
    const resolved = seen.filter((x, i) => i === 0 || x - (seen[i - 1] as number) > fwhm).length;
    if (resolved < 2) return null;
    // A detection limit: the k strongest lines are seen, the rest fall below it.
    const k = k0;
    const top = visible[0]?.intensity ?? 1;
    for (const line of visible.slice(0, k)) {
      const observedVac = line.vacuum_nm * (1 + z);
      const shown = o.medium === 'air' ? vacuumToAir(observedVac) : observedVac;
      const intensity = (line.intensity / top) * Math.exp(0.5 * gauss(rand)) * 100;
      rows.push({ wavelength: shown + o.sigma_nm * gauss(rand), intensity });
    }
  }
  const spurious = poisson(rand, o.spuriousMean);
  for (let i = 0; i < spurious; i++) {
    rows.push({
      wavelength: o.range_nm[0] + rand() * (o.range_nm[1] - o.range_nm[0]),
      intensity: 5 + rand() * 30,
    });
  }
  rows.sort((a, b) => a.wavelength - b.wavelength);
  const shift = o.searchRange
    ? `shift: { redshift: { search: [${o.searchRange[0]}, ${o.searchRange[1]}] } }\n`
    : '';
  const groups = o.groups.length ? `candidates: { groups: [${o.groups.join(', ')}] }\n` : '';
  const yaml =
    `lineledger: 1\nsource: { kind: ${o.sourceKind} }\nmedium: ${o.medium}\n` +
    `instrument: { resolution_nm: ${fwhm.toFixed(2)}, range_nm: [${o.range_nm[0]}, ${o.range_nm[1]}] }\n` +
    `measurement: { sigma: ${o.sigma_nm} }\n${shift}${groups}lines:\n` +
    rows
      .map((r) => `  - { wavelength: ${r.wavelength.toFixed(3)}, intensity: ${r.intensity.toFixed(1)} }\n`)
      .join('');
  return { yaml, truth: [...o.species].sort(), z: o.z, lineCount: rows.length };
}
