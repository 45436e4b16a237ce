import { describe, expect, it } from 'vitest';
import { parseFitsProfile } from '../../src/session/profile/fits.js';
import { FITS_BLOCK_BYTES, parseFitsHeader, parseFitsValue } from '../../src/session/profile/fitsHeader.js';
import { readProfileBytes } from '../../src/session/profile/read.js';
import { fitsFile, fitsTableFile, header, primary } from './fitsWriter.js';

const ramp = (n: number) => Array.from({ length: n }, (_, i) => i * 3);

describe('FITS header values (FITS Standard 4.0 §4.2, from memory)', () => {
  it("§4.2.1: a quote inside a string is written twice ('O''HARA' is O'HARA)", () => {
    expect(parseFitsValue(" 'O''HARA'           / a name")).toBe("O'HARA");
  });
  it('§4.2.1: trailing spaces in a string are not significant, leading ones are', () => {
    expect(parseFitsValue("'WAVE    '")).toBe('WAVE');
    expect(parseFitsValue("'  AWAV'")).toBe('  AWAV');
  });
  it('§4.2.2 / §4.2.3 / §4.2.4: logical T/F, integers, reals with E or D exponents', () => {
    expect(parseFitsValue('                   T')).toBe(true);
    expect(parseFitsValue('                   F / comment')).toBe(false);
    expect(parseFitsValue('                -32')).toBe(-32);
    expect(parseFitsValue('          6.5628D+03')).toBeCloseTo(6562.8, 9);
    expect(parseFitsValue('            1.25E-1 /')).toBeCloseTo(0.125, 12);
  });
  it('§4.1.2.3: a value field of spaces is an undefined value', () => {
    expect(parseFitsValue('                     / nothing')).toBeNull();
  });
});

describe('FITS header records and blocks (FITS Standard 4.0 §3.1, §4.1, §4.4.1, from memory)', () => {
  it('the data start at the first 2880-byte block after the END record', () => {
    // 35 cards + END fill exactly one block of 36 records; one more card needs a second block.
    const fill = (k: number) => Array.from({ length: k }, (_, i): [string, number] => [`KEY${i}`, i]);
    const one = parseFitsHeader(new TextEncoder().encode(header(primary(8, 1, fill(31)))));
    const two = parseFitsHeader(new TextEncoder().encode(header(primary(8, 1, fill(32)))));
    expect(one.ok && one.header.dataOffset).toBe(FITS_BLOCK_BYTES);
    expect(two.ok && two.header.dataOffset).toBe(2 * FITS_BLOCK_BYTES);
  });
  it('COMMENT and HISTORY records carry no value and are skipped (§4.4.2.4)', () => {
    const h = parseFitsHeader(
      new TextEncoder().encode(
        header(primary(8, 1, [['COMMENT   CRVAL1 = 12 is not a value'], ['CRVAL1', 5]])),
      ),
    );
    expect(h.ok && h.header.values.get('CRVAL1')).toBe(5);
  });
  it('a file that does not begin with SIMPLE = T is not FITS', () => {
    const h = parseFitsHeader(
      new TextEncoder().encode(
        header([
          ['SIMPLE', false],
          ['BITPIX', 8],
        ]),
      ),
    );
    expect(h.ok).toBe(false);
  });
  it('a header without END is cut short', () => {
    const text = header(primary(8, 4)).replace(/END {77}/, ' '.repeat(80));
    expect(parseFitsHeader(new TextEncoder().encode(text)).ok).toBe(false);
  });
});

describe('FITS primary array data (FITS Standard 4.0 §5 and §4.4.2.5, from memory)', () => {
  for (const bitpix of [8, 16, 32, -32, -64] as const) {
    it(`BITPIX ${bitpix}: big-endian values read back`, () => {
      const values = ramp(20);
      const r = parseFitsProfile(fitsFile(primary(bitpix, 20), bitpix, values), 'x.fits');
      expect(r.ok).toBe(true);
      if (r.ok) expect(r.profile.intensity).toEqual(values);
    });
  }
  it('§4.4.2.5: physical value = BZERO + BSCALE × array value (unsigned 16-bit with BZERO 32768)', () => {
    // §5.2.5 (from memory): unsigned 16-bit integers are stored as signed with BZERO = 32768.
    const stored = [-32768, 0, 32767];
    const r = parseFitsProfile(
      fitsFile(
        primary(16, 3, [
          ['BZERO', 32768],
          ['BSCALE', 1],
        ]),
        16,
        stored,
      ),
      'x.fits',
    );
    expect(r.ok && r.profile.intensity).toEqual([0, 32768, 65535]);
    const scaled = parseFitsProfile(
      fitsFile(
        primary(16, 2, [
          ['BZERO', 10],
          ['BSCALE', 0.5],
        ]),
        16,
        [4, -4],
      ),
      'x',
    );
    expect(scaled.ok && scaled.profile.intensity).toEqual([12, 8]);
  });
  it('§4.4.2.5: BLANK marks undefined integers, which are left out with a warning', () => {
    const values = ramp(20);
    values[3] = -999;
    const checked = readProfileBytes(fitsFile(primary(16, 20, [['BLANK', -999]]), 16, values), 'x.fits', {
      axis: 'pixel',
      nmPerUnit: 1,
    });
    expect(checked.profile?.x.length).toBe(19);
    expect(checked.warnings.map((w) => w.code)).toEqual(['profile-undefined-values']);
  });
  it('NAXIS = 0 (no primary array) is refused', () => {
    const r = parseFitsProfile(
      fitsFile(
        [
          ['SIMPLE', true],
          ['BITPIX', 8],
          ['NAXIS', 0],
        ],
        8,
        [],
      ),
      'x.fits',
    );
    expect(r.ok).toBe(false);
  });
  it('a header claiming more points than the limit is refused before anything is allocated', () => {
    const r = parseFitsProfile(new TextEncoder().encode(header(primary(8, 2_000_000))), 'x.fits');
    expect(!r.ok && r.problems[0]?.message).toMatch(/limit is 1000000/);
  });
  it('a data part shorter than NAXIS1 points is refused', () => {
    const bytes = fitsFile(primary(-64, 1000), -64, ramp(1000)).subarray(0, 2880 * 2);
    expect(parseFitsProfile(bytes, 'x.fits').ok).toBe(false);
  });
});

describe('FITS spectral axis (Standard 4.0 §8; Greisen et al. 2006, Paper III; from memory)', () => {
  it('without CTYPE1 the axis is pixels counted from 1 at the first pixel centre (§8.1)', () => {
    const r = parseFitsProfile(fitsFile(primary(-32, 4), -32, [1, 2, 3, 4]), 'x.fits');
    expect(r.ok && r.profile.axis).toBe('pixel');
    expect(r.ok && r.profile.x).toEqual([1, 2, 3, 4]);
  });
  it('λ(p) = CRVAL1 + CDELT1 · (p − CRPIX1), CTYPE1 AWAV is air, CUNIT1 Angstrom', () => {
    const cards = primary(-32, 5, [
      ['CTYPE1', 'AWAV'],
      ['CUNIT1', 'Angstrom'],
      ['CRVAL1', 6562.8],
      ['CRPIX1', 3],
      ['CDELT1', 0.5],
    ]);
    const r = parseFitsProfile(fitsFile(cards, -32, [1, 2, 3, 4, 5]), 'x.fits');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.profile.medium).toBe('air');
    expect(r.profile.axis).toBe('wavelength');
    for (const [i, nm] of [656.18, 656.23, 656.28, 656.33, 656.38].entries())
      expect(r.profile.x[i]).toBeCloseTo(nm, 9);
  });
  it('CTYPE1 WAVE is vacuum; with no CUNIT1 the unit is the metre (Paper III, Table 1)', () => {
    const cards = primary(-64, 3, [
      ['CTYPE1', 'WAVE'],
      ['CRVAL1', 5e-7],
      ['CRPIX1', 1],
      ['CDELT1', 1e-10],
    ]);
    const r = parseFitsProfile(fitsFile(cards, -64, [1, 2, 3]), 'x.fits');
    expect(r.ok && r.profile.medium).toBe('vacuum');
    if (r.ok) expect(r.profile.x.map((v) => Number(v.toFixed(9)))).toEqual([500, 500.1, 500.2]);
  });
  it('CD1_1 gives the step when written (it takes precedence over CDELT1, Paper I §2.1.2)', () => {
    const cards = primary(-64, 2, [
      ['CTYPE1', 'WAVE'],
      ['CUNIT1', 'nm'],
      ['CRVAL1', 400],
      ['CRPIX1', 1],
      ['CDELT1', 9],
      ['CD1_1', 2],
    ]);
    const r = parseFitsProfile(fitsFile(cards, -64, [1, 2]), 'x.fits');
    expect(r.ok && r.profile.x).toEqual([400, 402]);
  });
  it('a non-linear or non-wavelength CTYPE1 (WAVE-LOG, FREQ) is refused, not misread', () => {
    for (const t of ['WAVE-LOG', 'FREQ']) {
      const cards = primary(-64, 2, [
        ['CTYPE1', t],
        ['CRVAL1', 400],
        ['CDELT1', 1],
      ]);
      expect(parseFitsProfile(fitsFile(cards, -64, [1, 2]), 'x.fits').ok).toBe(false);
    }
  });
});

describe('FITS binary table spectra (FITS Standard 4.0 §7.3; Greisen et al. 2006; from memory)', () => {
  const n = 20;
  const wave = Array.from({ length: n }, (_, i) => 6550 + 0.5 * i);
  it('one point per row: WAVE (Angstrom, TCTYP AWAV), FLUX and ERR columns', () => {
    const bytes = fitsTableFile([
      { name: 'WAVE', type: 'D', unit: 'Angstrom', ctype: 'AWAV', rows: wave.map((w) => [w]) },
      { name: 'FLUX', type: 'E', rows: wave.map((_, i) => [100 + i]) },
      { name: 'ERR', type: 'E', rows: wave.map(() => [2]) },
    ]);
    const r = readProfileBytes(bytes, 't.fits', { axis: 'wavelength', nmPerUnit: 1 });
    expect(r.problems).toEqual([]);
    expect(r.profile?.medium).toBe('air');
    expect(r.profile?.x[2]).toBeCloseTo(655.1, 9);
    expect(r.profile?.intensity[3]).toBe(103);
    expect(r.profile?.sigma?.[0]).toBe(2);
  });
  it('one row of vector columns; TSCAL/TZERO scale an integer column (§7.3.2)', () => {
    const bytes = fitsTableFile([
      { name: 'WAVELENGTH', type: 'E', unit: 'nm', rows: [wave.map((w) => w / 10)] },
      { name: 'COUNTS', type: 'I', scale: 0.5, zero: 1000, rows: [wave.map((_, i) => i)] },
    ]);
    const r = readProfileBytes(bytes, 't.fits', { axis: 'wavelength', nmPerUnit: 1 });
    expect(r.problems).toEqual([]);
    expect(r.profile?.medium).toBeNull();
    expect(r.profile?.intensity.slice(0, 3)).toEqual([1000, 1000.5, 1001]);
  });
  it('a wavelength column without a unit is refused rather than guessed', () => {
    const bytes = fitsTableFile([
      { name: 'WAVE', type: 'D', rows: wave.map((w) => [w]) },
      { name: 'FLUX', type: 'E', rows: wave.map(() => [1]) },
    ]);
    const r = readProfileBytes(bytes, 't.fits', { axis: 'wavelength', nmPerUnit: 1 });
    expect(r.problems[0]?.message).toMatch(/unit/);
  });
});
