/** Unknown shifts, telluric lines and bad input for identification. */
import { describe, expect, it } from 'vitest';
import { ELECTRON_PROTON_MASS_RATIO, RYDBERG_INFINITY_PER_M } from '../src/constants.js';
import { runSession } from '../src/pipeline.js';
import { redshiftFromVelocity } from '../src/reduce/doppler.js';
import { bundledCatalog } from './helpers/catalog.js';

const catalog = bundledCatalog();

/** Balmer line n → 2, vacuum nm, from the Rydberg formula with reduced mass (CODATA 2018 constants). */
function balmerVacuum_nm(n: number): number {
  const rH = RYDBERG_INFINITY_PER_M / (1 + ELECTRON_PROTON_MASS_RATIO);
  return 1e9 / (rH * (1 / 4 - 1 / (n * n)));
}

function identified(yaml: string) {
  const out = runSession('s.yaml', yaml, catalog);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out;
}

describe('unknown redshift', () => {
  it('recovers z = 0.158 from Balmer lines computed with the Rydberg formula', () => {
    // The redshift of 3C 273, about 0.158 (from memory); the lines are exact Balmer wavelengths × (1 + z) with offsets.
    const z = 0.158;
    const offsets = [0.3, -0.2, 0.25, -0.35];
    const lines = [3, 4, 5, 6].map(
      (n, i) => `  - { wavelength: ${(balmerVacuum_nm(n) * (1 + z) + (offsets[i] as number)).toFixed(3)} }`,
    );
    const out = identified(
      `lineledger: 1\nsource: { kind: galaxy }\nmedium: vacuum\ninstrument: { resolution_nm: 2, range_nm: [420, 800] }\nmeasurement: { sigma: 0.5 }\nshift: { redshift: { search: [0, 1] } }\nlines:\n${lines.join('\n')}\n`,
    );
    const found = out.identification.shift;
    expect(found).not.toBeNull();
    expect(out.identification.explanation.species).toContain('H I');
    expect(Math.abs((found?.z ?? 0) - z)).toBeLessThan(3 * (found?.z_sigma ?? 0) + 1e-4);
    expect(found?.z_sigma).toBeGreaterThan(0);
    expect(found?.z_sigma).toBeLessThan(0.002);
    // Lines are moved to the rest frame for the record.
    expect(out.reduction.lines[0]?.rest_vacuum_nm).toBeCloseTo(
      balmerVacuum_nm(3) + (offsets[0] as number) / (1 + z),
      0,
    );
  });

  it('finds a radial velocity of +150 km/s and reports it in km/s', () => {
    const z = redshiftFromVelocity(150);
    const lines = [3, 4, 5, 6, 7].map(
      (n) => `  - { wavelength: ${(balmerVacuum_nm(n) * (1 + z)).toFixed(3)} }`,
    );
    const out = identified(
      `lineledger: 1\nsource: { kind: star }\nmedium: vacuum\ninstrument: { resolution_nm: 0.1, range_nm: [380, 700] }\nmeasurement: { sigma: 0.02 }\nshift: { velocity_km_s: { search: [-500, 500] } }\nlines:\n${lines.join('\n')}\n`,
    );
    const found = out.identification.shift;
    expect(found?.mode).toBe('velocity');
    expect(Math.abs((found?.velocity_km_s ?? 0) - 150)).toBeLessThan(5);
  });
});

describe('selections still list the stronger lines of a species they name', () => {
  it('a 3σ-low Hα is not taken for [N II] 654.8 when [N II] 658.4, about three times brighter, is absent', () => {
    // [N II] 658.4 / 654.8 ≈ 3 in every nebula (the ratio of their transition probabilities,
    // Osterbrock & Ferland 2006, ch. 3; from memory). A list that names 654.8 but not 658.4
    // is not a list of [N II]. Balmer lines from the Rydberg formula; Hα read 1.5 nm short.
    const z = 0.0859;
    const offsets: Record<number, number> = { 3: -1.47, 4: 0.05, 5: -0.1, 6: 0.2, 7: -0.3 };
    const lines = [3, 4, 5, 6, 7].map(
      (n) => `  - { wavelength: ${(balmerVacuum_nm(n) * (1 + z) + (offsets[n] as number)).toFixed(3)} }`,
    );
    const out = identified(
      `lineledger: 1\nsource: { kind: galaxy }\nmedium: vacuum\ninstrument: { resolution_nm: 1, range_nm: [380, 900] }\nmeasurement: { sigma: 0.5 }\nshift: { redshift: { search: [0, 0.6] } }\ncandidates: { groups: [quasar] }\nlines:\n${lines.join('\n')}\n`,
    );
    expect(out.identification.explanation.species).toEqual(['H I']);
    expect(Math.abs((out.identification.shift?.z ?? 0) - z)).toBeLessThan(0.002);
  });
});

describe('absorption and telluric lines', () => {
  it('blames the O₂ A band on the atmosphere, not the star', () => {
    // NIST ASD air wavelengths of Hα, Hβ, Hγ and Na I D; the O₂ A-band head near 759.4 nm (air; Fraunhofer A, from the catalog's telluric rows).
    const out = identified(
      'lineledger: 1\nsource: { kind: star }\ninstrument: { resolution_nm: 0.5, range_nm: [420, 780] }\nmeasurement: { sigma: 0.15 }\nlines:\n' +
        [656.28, 486.13, 434.05, 589.0, 589.59, 759.37]
          .map((w) => `  - { wavelength: ${w}, kind: absorption }`)
          .join('\n') +
        '\n',
    );
    const a = out.identification.lines.find((l) => l.index === 5)?.assignment;
    expect(a?.species).toBe('O2');
    const o2 = out.identification.candidates.find((c) => c.species === 'O2');
    expect(o2?.telluric).toBe(true);
    expect(out.identification.explanation.species).toEqual(expect.arrayContaining(['H I', 'Na I']));
  });
});

describe('bad input gets a clear message or a labelled weak result', () => {
  const base = 'lineledger: 1\nsource: { kind: lamp }\n';
  it('lines outside every reference line', () => {
    const out = identified(
      `${base}lines:\n  - { wavelength: 5000 }\n  - { wavelength: 5200 }\n  - { wavelength: 5400 }\n`,
    );
    expect(out.identification.explanation.status).toBe('unexplained');
    expect(out.warnings.map((w) => w.code)).toContain('outside-catalog');
  });
  it('a single line', () => {
    const out = identified(`${base}lines:\n  - { wavelength: 589.0, sigma: 0.3 }\n`);
    expect(out.warnings.map((w) => w.code)).toContain('few-lines');
  });
  it('zero sigma', () => {
    const out = identified(
      `${base}lines:\n${[404.656, 435.833, 546.074].map((w) => `  - { wavelength: ${w}, sigma: 0 }`).join('\n')}\n`,
    );
    expect(out.warnings.map((w) => w.code)).toContain('zero-sigma');
    expect(out.identification.explanation.species).toEqual(['Hg I']);
  });
  it('candidate groups that do not exist', () => {
    const out = identified(
      `${base}candidates: { groups: [discharge-gasses] }\nlines:\n  - { wavelength: 589.0 }\n  - { wavelength: 589.6 }\n`,
    );
    const codes = out.warnings.map((w) => w.code);
    expect(codes).toContain('unknown-candidate');
    expect(codes).toContain('no-candidates');
    expect(out.warnings.find((w) => w.code === 'unknown-candidate')?.hint).toContain('discharge-gases');
    expect(out.identification.explanation.status).toBe('unexplained');
  });
  it('hundreds of lines', () => {
    let x = 12345;
    const next = () => {
      x = (x * 1103515245 + 12345) % 2147483648;
      return x / 2147483648;
    };
    const lines = Array.from({ length: 300 }, () => `  - { wavelength: ${(400 + 300 * next()).toFixed(2)} }`);
    const out = identified(`${base}measurement: { sigma: 0.3 }\nlines:\n${lines.join('\n')}\n`);
    expect(out.identification.lines).toHaveLength(300);
    expect(out.identification.explanation.status).not.toBe('identified');
  });
});
