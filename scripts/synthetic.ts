/**
 * Synthetic sessions drawn from the bundled catalog with a fixed seed, for the identification
 * benchmark. Invented measurements only; the reference lines they are drawn from are the
 * catalog's. Each session knows its truth (species, and z when shifted).
 */

import { windowRange } from '../src/lines/search.js';
import type { Catalog } from '../src/lines/types.js';
import { airToVacuum, vacuumToAir } from '../src/reduce/airVacuum.js';
import { gaussianDeviate, mulberry32, poissonDeviate } from '../test/helpers/random.js';

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

/** Features closer than fwhm_nm to their neighbour, merged: intensity-weighted centre, summed intensity. */
function mergeUnresolved(
  rows: readonly Feature[],
  fwhm_nm: number,
): { wavelength: number; intensity: number; owners: Set<string | null> }[] {
  const sorted = [...rows].sort((a, b) => a.wavelength - b.wavelength);
  const out: {
    wavelength: number;
    intensity: number;
    weighted: number;
    last: number;
    owners: Set<string | null>;
  }[] = [];
  for (const r of sorted) {
    const prev = out.at(-1);
    if (prev && r.wavelength - prev.last < fwhm_nm) {
      prev.weighted += r.wavelength * r.intensity;
      prev.intensity += r.intensity;
      prev.wavelength = prev.weighted / prev.intensity;
      prev.last = r.wavelength;
      prev.owners.add(r.owner);
    } else
      out.push({
        wavelength: r.wavelength,
        intensity: r.intensity,
        weighted: r.wavelength * r.intensity,
        last: r.wavelength,
        owners: new Set([r.owner]),
      });
  }
  return out;
}

/** A feature before the instrument sees it: where, how bright, and which species made it (null: spurious). */
interface Feature {
  wavelength: number;
  intensity: number;
  owner: string | null;
}

export function makeSession(
  catalog: Catalog,
  rand: () => number,
  o: SyntheticOptions,
): SyntheticSession | null {
  const z = o.z ?? 0;
  const rows: Feature[] = [];
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
      rows.push({ wavelength: shown, intensity, owner: s });
    }
  }
  const spurious = poissonDeviate(rand, o.spuriousMean);
  for (let i = 0; i < spurious; i++) {
    rows.push({
      wavelength: o.range_nm[0] + rand() * (o.range_nm[1] - o.range_nm[0]),
      intensity: 5 + rand() * 30,
      owner: null,
    });
  }
  // What the instrument shows: features closer than one resolution element merge into one
  // (intensity-weighted centre, summed intensity), and only then is each reading's error added.
  // Listing unresolvable lines separately would ask the identification to explain readings no
  // real instrument could have made.
  const merged = mergeUnresolved(rows, fwhm);
  // A species must still show two features of its own after merging, else no measurement
  // could tell it is there (its lines hide inside another species' blends).
  for (const sp of o.species) {
    if (merged.filter((m) => m.owners.size === 1 && m.owners.has(sp)).length < 2) return null;
  }
  rows.length = 0;
  for (const r of merged)
    rows.push({ wavelength: r.wavelength + o.sigma_nm * gauss(rand), intensity: r.intensity, owner: null });
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
