import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  cleanCell,
  convertNistExport,
  type NistImportOptions,
  parseIntensity,
  romanNumeral,
} from '../../src/lines/nistImport.js';
import { parseCatalog } from '../../src/lines/parse.js';
import { airToVacuum, vacuumToAir } from '../../src/reduce/airVacuum.js';

const FIXTURES = join('test', 'fixtures', 'nist');
const SOURCES = readFileSync(join('data', 'lines', 'sources.yaml'), 'utf8');
const fixture = (name: string) => readFileSync(join(FIXTURES, name), 'utf8');

const options = (o: Partial<NistImportOptions> = {}): NistImportOptions => ({
  species: null,
  medium: null,
  sourceKey: 'nist-asd',
  ...o,
});

function convert(text: string, o: Partial<NistImportOptions> = {}, file = 'export.txt') {
  const r = convertNistExport(text, file, options(o));
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r;
}

/** The converter's TSV through the catalog's own parser, with the bundled sources. */
function parseOutput(tsv: string) {
  const parsed = parseCatalog({
    version: '0.0.0',
    lineFiles: [{ name: 'imported.tsv', text: tsv }],
    sourceFiles: [{ name: 'sources.yaml', text: SOURCES }],
    groupsYaml: null,
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.diagnostics));
  return parsed.value;
}

describe('NIST ASD import: the fixtures', () => {
  // Expected values: NIST ASD air wavelengths, Hα 656.279, Hβ 486.135, Hγ 434.0472 nm
  // (Kramida et al., NIST Atomic Spectra Database; as the bundled catalog holds them).
  it('converts the tab-delimited H I export into rows the catalog parser accepts', () => {
    const r = convert(fixture('h-i-lines.tsv'), { species: 'H I' }, 'h-i-lines.tsv');
    const h = parseOutput(r.value.tsv).species.get('H I');
    if (!h) throw new Error('no H I');
    expect(h.vacuum_nm.length).toBe(5);
    const air = [...h.air_nm].filter((a) => !Number.isNaN(a));
    for (const nist of [656.279, 486.135, 434.0472])
      expect(Math.min(...air.map((a) => Math.abs(a - nist)))).toBeLessThan(0.0005);
    expect(h.origin.every((o) => o === 'read')).toBe(true);
    expect(h.source.every((s) => s === 'nist-asd')).toBe(true);
  });

  it('computes the missing medium with the IAU formula, and writes no air wavelength below 200 nm', () => {
    const r = convert(fixture('h-i-lines.tsv'), { species: 'H I' });
    const [lya, ...optical] = r.value.rows;
    // Lyman α: the export's vacuum section (header repeated at 200 nm), 121.567 nm vacuum.
    expect(lya?.vacuum_nm).toBeCloseTo(121.567, 6);
    expect(lya?.air_nm).toBeNull();
    expect(r.value.tsv).toMatch(/^H I\t121\.5670\t-\t/m);
    for (const row of optical) {
      expect(Math.abs(vacuumToAir(row.vacuum_nm) - (row.air_nm as number))).toBeLessThan(1e-6);
    }
    // Hα vacuum as NIST ASD lists it: 656.460 nm (0.181 nm above air).
    expect(Math.abs((optical.find((o) => o.air_nm === 656.279)?.vacuum_nm as number) - 656.46)).toBeLessThan(
      0.001,
    );
  });

  it('maps P to persistent, gives a blank intensity 1 with a warning, and keeps (500) as 500', () => {
    const r = convert(fixture('h-i-lines.tsv'), { species: 'H I' });
    const byAir = new Map(r.value.rows.map((row) => [row.air_nm?.toFixed(3), row]));
    expect(byAir.get('656.279')?.flags).toEqual(['persistent']);
    expect(byAir.get('846.725')?.intensity).toBe(500);
    expect(r.value.rows[0]?.intensity).toBe(1);
    expect(r.warnings.some((w) => w.field === 'intens' && w.line === 2)).toBe(true);
    expect(byAir.get('434.047')?.basis).toBe('ritz');
  });

  it('picks one spectrum of a several-spectra CSV export (element, sp_num, ="…" cells)', () => {
    // Na I D lines: NIST ASD air 588.995 and 589.592 nm (Kramida et al.).
    const r = convert(fixture('h-na-lines.csv'), { species: 'Na I' });
    const na = parseOutput(r.value.tsv).species.get('Na I');
    if (!na) throw new Error('no Na I');
    const air = [...na.air_nm];
    for (const nist of [588.995, 589.592])
      expect(Math.min(...air.map((a) => Math.abs(a - nist)))).toBeLessThan(0.005);
    expect(r.value.rows.every((row) => row.species === 'Na I')).toBe(true);
    // 819.4824 nm is listed twice (two classifications): kept once, with a warning.
    expect(r.value.rows.filter((row) => row.air_nm === 819.4824)).toHaveLength(1);
    expect(r.warnings.some((w) => w.message.includes('kept once'))).toBe(true);
    expect(r.value.rows.find((row) => row.air_nm === 568.8205)?.flags).toEqual(['blend']);
  });

  it('without --species, names every spectrum from element and sp_num', () => {
    const r = convert(fixture('h-na-lines.csv'));
    const parsed = parseOutput(r.value.tsv);
    expect(parsed.names).toEqual(['H I', 'Na I']);
  });

  it('refuses a spectrum the export does not hold, saying which it holds', () => {
    const r = convertNistExport(fixture('h-na-lines.csv'), 'h-na-lines.csv', options({ species: 'Fe I' }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.diagnostics[0]?.hint).toBe('it has H I, Na I');
  });
});

// Synthetic exports: made-up numbers that only test the rules, not physics.
describe('NIST ASD import: the rules', () => {
  const head = 'obs_wl_air(nm)\tunc_obs_wl\tritz_wl_air(nm)\tunc_ritz_wl\tintens\tType';

  it('prefers the observed wavelength to the Ritz one, and takes the Ritz one when none was observed', () => {
    const r = convert(`${head}\n500.000\t0.002\t500.010\t0.0001\t10\t\n\t\t510.0100\t0.0001\t20\t\n`, {
      species: 'X I',
    });
    expect(r.value.rows.map((row) => [row.air_nm, row.unc_nm, row.basis])).toEqual([
      [500, 0.002, 'observed'],
      [510.01, 0.0001, 'ritz'],
    ]);
  });

  it('marks forbidden lines from the Type column (M1, E2) and the f descriptor', () => {
    const r = convert(
      `${head}\n500.0\t\t\t\t10\tM1\n501.0\t\t\t\t10\tE2\n502.0\t\t\t\t10f\t\n503.0\t\t\t\t10\tE1\n`,
      {
        species: 'X III',
      },
    );
    expect(r.value.rows.map((row) => row.flags)).toEqual([['forbidden'], ['forbidden'], ['forbidden'], []]);
  });

  it('reads wavelengths in ångström and vacuum, and uses --medium only where the column does not say', () => {
    const angstrom = convert('obs_wl_vac(A)\tintens\n5000.00\t10\n', { species: 'X I' });
    expect(angstrom.value.rows[0]?.vacuum_nm).toBe(500);
    expect(angstrom.value.rows[0]?.air_nm).toBeCloseTo(vacuumToAir(500), 9);
    const unsaid = convert('obs_wl(nm)\tintens\n500.000\t10\n', { species: 'X I', medium: 'air' });
    expect(unsaid.value.rows[0]?.vacuum_nm).toBeCloseTo(airToVacuum(500), 9);
    const missing = convertNistExport(
      'obs_wl(nm)\tintens\n500.000\t10\n',
      'x.txt',
      options({ species: 'X I' }),
    );
    expect(missing.ok).toBe(false);
    const conflict = convertNistExport(
      'obs_wl_air(nm)\tintens\n500.000\t10\n',
      'x.txt',
      options({ species: 'X I', medium: 'vacuum' }),
    );
    expect(conflict.ok).toBe(false);
    if (!conflict.ok) expect(conflict.diagnostics[0]).toMatchObject({ line: 1, col: 1, code: 'nist-import' });
  });

  it('says where the export has no header it can read', () => {
    const r = convertNistExport('wavelength,intensity\n500,10\n', 'x.csv', options({ species: 'X I' }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.diagnostics[0]?.field).toBe('header');
  });

  it('reads the intensity notation', () => {
    expect(parseIntensity('1000P')).toEqual({ value: 1000, flags: ['persistent'], dropped: [] });
    expect(parseIntensity('500bl')).toEqual({ value: 500, flags: ['blend'], dropped: [] });
    expect(parseIntensity('(30)')).toEqual({ value: 30, flags: [], dropped: [] });
    expect(parseIntensity('70*')).toEqual({ value: 70, flags: [], dropped: ['*'] });
    expect(parseIntensity('200hfs')).toEqual({ value: 200, flags: [], dropped: ['hfs'] });
    expect(parseIntensity('bl')).toEqual({ value: null, flags: ['blend'], dropped: [] });
    expect(parseIntensity('')).toEqual({ value: null, flags: [], dropped: [] });
    expect(cleanCell('="656.279"')).toBe('656.279');
    expect(cleanCell('"=""656.279"""')).toBe('656.279');
    expect([1, 2, 3, 4, 9, 14].map(romanNumeral)).toEqual(['I', 'II', 'III', 'IV', 'IX', 'XIV']);
  });
});
