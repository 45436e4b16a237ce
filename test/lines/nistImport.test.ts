import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  cleanCell,
  convertNistExport,
  type ImportedRow,
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
    expect(parseIntensity('70*')).toEqual({ value: 70, flags: ['shared-intensity'], dropped: [] });
    expect(parseIntensity('200hfs')).toEqual({ value: 200, flags: ['hyperfine-structure'], dropped: [] });
    expect(parseIntensity('110d,bl(Fe II)*')).toEqual({
      value: 110,
      flags: ['diffuse', 'blend', 'shared-intensity'],
      dropped: [],
    });
    expect(parseIntensity('250blNe*').flags).toEqual(['blend', 'shared-intensity']);
    expect(parseIntensity('50aff(Fe I)')).toEqual({ value: 50, flags: [], dropped: ['aff'] });
    expect(parseIntensity('12:')).toEqual({ value: 12, flags: [], dropped: [':'] });
    expect(parseIntensity('bl')).toEqual({ value: null, flags: ['blend'], dropped: [] });
    expect(parseIntensity('')).toEqual({ value: null, flags: [], dropped: [] });
    expect(cleanCell('="656.279"')).toBe('656.279');
    expect(cleanCell('"=""656.279"""')).toBe('656.279');
    expect([1, 2, 3, 4, 9, 14].map(romanNumeral)).toEqual(['I', 'II', 'III', 'IV', 'IX', 'XIV']);
  });
});

// Real excerpts of NIST ASD's fixed-width ASCII output (test/fixtures/nist/README.md): the rows
// as retrieved, cut down to a few dozen lines. Each check names spectrum, line and retrieval date.
describe('NIST ASD import: the ASCII table (real excerpts)', () => {
  const ascii = (name: string, species: string) => convert(fixture(name), { species }, name);
  const near = (rows: readonly ImportedRow[], vacuum_nm: number) =>
    rows.find((r) => Math.abs(r.vacuum_nm - vacuum_nm) < 0.0005);

  it('reads Hg I (retrieved 2016-04-21): vacuum from the table, air by the IAU formula', () => {
    const r = ascii('hg-i-ascii.txt', 'Hg I');
    const parsed = parseOutput(r.value.tsv).species.get('Hg I');
    if (!parsed) throw new Error('no Hg I');
    expect(r.value.tsv).toContain('ASCII table');
    // Hg I 4047.708, 4359.560, 5462.268, 5771.210, 5792.276 Å (vacuum, observed) in the table;
    // NIST ASD air 404.656, 435.833, 546.0735, 576.960, 579.066 nm (the catalog's named lines; from memory).
    const pairs: [number, number][] = [
      [404.7708, 404.656],
      [435.956, 435.833],
      [546.2268, 546.0735],
      [577.121, 576.96],
      [579.2276, 579.066],
    ];
    for (const [vacuum, air] of pairs) {
      const row = near(r.value.rows, vacuum);
      expect(row?.basis, `${vacuum}`).toBe('observed');
      // 0.002 nm: the catalog checks' tolerance for air computed from vacuum (docs/catalog.md).
      expect(Math.abs((row?.air_nm as number) - air), `${vacuum}`).toBeLessThan(0.002);
    }
    // Rel. Int. as printed: 12000 for 4047.708 and 4359.560 Å, 6000 for 5462.268 Å.
    expect(near(r.value.rows, 404.7708)?.intensity).toBe(12000);
    expect(near(r.value.rows, 546.2268)?.intensity).toBe(6000);
    // The separator rows and the commented header rows are not lines.
    expect(parsed.vacuum_nm.length).toBe(r.value.rows.length);
    expect(r.value.rows.every((row) => row.vacuum_nm > 280 && row.vacuum_nm < 582)).toBe(true);
  });

  it('resolves a blend into one line: Hg I 2800.78 Å (three components, Ritz 2800.674–2801.066 Å)', () => {
    const r = ascii('hg-i-ascii.txt', 'Hg I');
    const blend = r.value.rows.filter((row) => Math.abs(row.vacuum_nm - 280.078) < 0.001);
    expect(blend).toHaveLength(1);
    // Rel. Int. "1*" (shared by the components), Type E2 (electric quadrupole).
    expect(blend[0]?.flags).toEqual(expect.arrayContaining(['blend', 'shared-intensity', 'forbidden']));
    expect(r.warnings.some((w) => w.message.includes('blend resolved into components'))).toBe(true);
    // Hg I 2811.55 Å: Rel. Int. "d" only (diffuse, no number) and Type E2.
    const diffuse = near(r.value.rows, 281.155);
    expect(diffuse?.flags).toEqual(['diffuse', 'forbidden']);
    expect(diffuse?.intensity).toBe(1);
  });

  it('keeps the Rel. Int. descriptors of Fe II (retrieved 2020-04-23), blends with other spectra included', () => {
    const r = ascii('fe-ii-ascii.txt', 'Fe II');
    // 3001.170 Å "250bl(Fe II)?*": blended, questionable, intensity shared.
    expect(near(r.value.rows, 300.117)?.flags).toEqual(['blend', 'questionable', 'shared-intensity']);
    expect(near(r.value.rows, 300.117)?.intensity).toBe(250);
    // 3020.100 Å "90d,bl(Fe I)": diffuse, blended with an Fe I line.
    expect(near(r.value.rows, 302.01)?.flags).toEqual(['diffuse', 'blend']);
    // Fe II 4925.2962, 5019.8351 Å (vacuum): NIST ASD air 492.392 and 501.844 nm (from memory).
    expect(Math.abs((near(r.value.rows, 492.52962)?.air_nm as number) - 492.392)).toBeLessThan(0.001);
    expect(Math.abs((near(r.value.rows, 501.98351)?.air_nm as number) - 501.844)).toBeLessThan(0.001);
    expect(near(r.value.rows, 501.98351)?.intensity).toBe(8000);
  });

  it('reads the uncertainty columns of Ar II (retrieved 2018-10-03): O Unc. with the observed value', () => {
    const r = ascii('ar-ii-ascii.txt', 'Ar II');
    // Ar II 4881.22627 ± 0.00010 Å (vacuum), Rel. Int. 2239: the 488.0 nm argon-ion laser line,
    // NIST ASD air 487.9864 nm (from memory).
    const line = near(r.value.rows, 488.122627);
    expect(line?.unc_nm).toBeCloseTo(0.00001, 9);
    expect(line?.intensity).toBe(2239);
    expect(Math.abs((line?.air_nm as number) - 487.9864)).toBeLessThan(0.0005);
    // Ar II 5146.74143 Å, Rel. Int. 162: the 514.5 nm laser line, NIST ASD air 514.5308 nm (from memory).
    expect(Math.abs((near(r.value.rows, 514.674143)?.air_nm as number) - 514.5308)).toBeLessThan(0.0005);
    expect(near(r.value.rows, 514.674143)?.intensity).toBe(162);
    // 3000.984 Å with O Unc. 0.003 Å.
    expect(near(r.value.rows, 300.0984)?.unc_nm).toBeCloseTo(0.0003, 9);
  });

  it('reads Zn I (retrieved 2016-05-02): observed only, no Ritz column filled, r = self-reversed', () => {
    const r = ascii('zn-i-ascii.txt', 'Zn I');
    expect(r.value.rows.every((row) => row.basis === 'observed')).toBe(true);
    // Zn I 3283.28 Å "500r" and 3303.53 Å "800" (vacuum, as the table has them).
    expect(near(r.value.rows, 328.328)?.flags).toEqual(['self-reversed']);
    expect(near(r.value.rows, 328.328)?.intensity).toBe(500);
    expect(near(r.value.rows, 330.353)?.intensity).toBe(800);
    // 3345.98 Å (vacuum): NIST ASD air 334.502 nm (from memory).
    expect(Math.abs((near(r.value.rows, 334.598)?.air_nm as number) - 334.502)).toBeLessThan(0.001);
    // No stated uncertainty: one unit of the last decimal written (0.01 Å = 0.001 nm).
    expect(near(r.value.rows, 334.598)?.unc_nm).toBeCloseTo(0.001, 9);
  });
});

describe('NIST ASD import: what it refuses', () => {
  const fails = (text: string, o: Partial<NistImportOptions>) => {
    const r = convertNistExport(text, 'export.txt', options(o));
    if (r.ok) throw new Error('expected a refusal');
    return r.diagnostics.map((d) => d.message).join('\n');
  };
  it.each(['<script>alert(1)</script>', '999 999', 'Fe', 'fe i'])('refuses --species %s', (name) => {
    expect(fails(fixture('h-i-lines.tsv'), { species: name })).toMatch(/not a spectrum name/);
  });

  it('refuses an intensity that would be written as Infinity (the loader rejects it)', () => {
    const huge = '9'.repeat(400);
    const text = fixture('h-i-lines.tsv').replace('"80000P"', `"${huge}"`);
    expect(fails(text, { species: 'H I' })).toMatch(/would not load/);
  });

  it('warns that an export without element columns is labelled only by --species', () => {
    const r = convertNistExport(fixture('h-i-lines.tsv'), 'export.txt', options({ species: 'Fe I' }));
    if (!r.ok) throw new Error('should convert');
    expect(r.warnings.map((w) => w.message).join('\n')).toMatch(/does not name its spectrum/);
  });
});
