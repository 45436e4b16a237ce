import { describe, expect, it } from 'vitest';
import { ELECTRON_PROTON_MASS_RATIO, RYDBERG_INFINITY_PER_M } from '../src/constants.js';
import { windowRange } from '../src/lines/search.js';
import { airToVacuum, vacuumToAir } from '../src/reduce/airVacuum.js';
import { bundledCatalog } from './helpers/catalog.js';

const catalog = bundledCatalog();

function nearestAir(species: string, air_nm: number): number {
  const lines = catalog.species.get(species);
  if (!lines) throw new Error(`no ${species}`);
  let best = Number.POSITIVE_INFINITY;
  for (const a of lines.air_nm) if (Math.abs(a - air_nm) < Math.abs(best - air_nm)) best = a;
  return best;
}

describe('bundled catalog', () => {
  it('parses, with sorted positive wavelengths, no duplicates, and every source resolved', () => {
    expect(catalog.names.length).toBeGreaterThanOrEqual(6);
    for (const name of catalog.names) {
      const l = catalog.species.get(name);
      if (!l) throw new Error(name);
      for (let k = 0; k < l.vacuum_nm.length; k++) {
        expect(l.vacuum_nm[k]).toBeGreaterThan(0);
        if (k > 0) expect(l.vacuum_nm[k]).toBeGreaterThan(l.vacuum_nm[k - 1] as number);
        expect(catalog.sources.has(l.source[k] as string)).toBe(true);
      }
    }
    expect(catalog.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(catalog.version).toMatch(/^\d{4}\.\d+\.\d+$/);
  });

  it('has air and vacuum columns that agree through the IAU conversion to 0.002 nm', () => {
    for (const name of catalog.names) {
      const l = catalog.species.get(name);
      if (!l) continue;
      for (let k = 0; k < l.vacuum_nm.length; k++) {
        const air = l.air_nm[k] as number;
        if (Number.isNaN(air)) continue;
        const diff = Math.abs(vacuumToAir(l.vacuum_nm[k] as number) - air);
        if (diff > 0.002)
          throw new Error(`${name} ${l.row[k]}: air/vacuum disagree by ${diff.toFixed(4)} nm`);
      }
    }
  });

  // NIST ASD air wavelengths (Kramida et al., NIST Atomic Spectra Database), as quoted in the
  // foundation issue's list of well-known lines; tolerance 0.005 nm.
  const NIST_AIR: [string, number][] = [
    ['H I', 656.279],
    ['H I', 486.135],
    ['Na I', 588.995],
    ['Na I', 589.592],
    ['Hg I', 404.656],
    ['Hg I', 435.833],
    ['Hg I', 546.074],
    ['Hg I', 576.96],
    ['Hg I', 579.066],
    ['He I', 447.148],
    ['He I', 501.568],
    ['He I', 587.562],
    ['He I', 667.815],
    ['He I', 706.519],
    ['Ne I', 585.249],
    ['Ne I', 640.225],
  ];
  it.each(NIST_AIR)('holds %s %f nm (NIST ASD, air) to 0.005 nm', (species, air) => {
    expect(Math.abs(nearestAir(species, air) - air)).toBeLessThan(0.005);
  });

  it('holds the Balmer lines as the Rydberg formula with reduced mass gives them (CODATA 2018) to 0.01 nm', () => {
    // 1/λ = R∞/(1 + mₑ/mₚ) · (1/2² − 1/n²), vacuum. Fine structure is below 0.01 nm here.
    const rH = RYDBERG_INFINITY_PER_M / (1 + ELECTRON_PROTON_MASS_RATIO);
    const h = catalog.species.get('H I');
    if (!h) throw new Error('no H I');
    for (let n = 3; n <= 8; n++) {
      const vacuum_nm = 1e9 / (rH * (1 / 4 - 1 / (n * n)));
      const [start, end] = windowRange(h.vacuum_nm, vacuum_nm - 0.05, vacuum_nm + 0.05);
      expect(end - start, `H I n=${n} near ${vacuum_nm.toFixed(3)} nm`).toBeGreaterThan(0);
      expect(Math.abs((h.vacuum_nm[start] as number) - vacuum_nm)).toBeLessThan(0.01);
    }
  });

  it('finds windows by binary search', () => {
    const values = Float64Array.from([1, 2, 2, 3, 5, 8]);
    expect(windowRange(values, 2, 3)).toEqual([1, 4]);
    expect(windowRange(values, 4, 4.5)).toEqual([4, 4]);
    expect(windowRange(values, 0, 100)).toEqual([0, 6]);
  });

  it('has the species the foundation needs with at least three lines in 380–700 nm', () => {
    for (const s of ['H I', 'He I', 'Ne I', 'Ar I', 'Hg I', 'Na I']) {
      const l = catalog.species.get(s);
      if (!l) throw new Error(`missing ${s}`);
      const [a, b] = windowRange(l.vacuum_nm, airToVacuum(380), airToVacuum(700));
      expect(b - a, s).toBeGreaterThanOrEqual(3);
    }
  });
});
