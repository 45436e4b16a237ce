/**
 * A 1-D spectrum in a FITS binary table (FITS Standard 4.0 §7.3, from memory): the first
 * extension after an empty primary array, XTENSION = 'BINTABLE', rows of NAXIS1 bytes with
 * columns described by TFORMn (repeat count and type letter, §7.3.3.1), TTYPEn (name), TUNITn
 * (unit) and TSCALn/TZEROn (scaling, §7.3.2). The spectrum is either one point per row (scalar
 * columns) or one row of vector columns. The wavelength column is named WAVE, WAVELENGTH or
 * LAMBDA and must give its unit; its TCTYPn (Greisen et al. 2006, Paper III, the table form of
 * CTYPE) says air (AWAV) or vacuum (WAVE) when written. The intensity column is named FLUX,
 * INTENSITY or COUNTS; an uncertainty column ERR, ERROR, SIGMA, FLUX_ERR or UNCERTAINTY is used
 * when present.
 */

import { MAX_PROFILE_POINTS } from './check.js';
import { type FitsValue, NM_PER_FITS_UNIT, parseFitsHeader } from './fitsHeader.js';
import type { ProfileParse } from './types.js';

/** Bytes per element of each TFORM type letter (§7.3.3.1, Table 18); X is bits. */
const TYPE_BYTES: Record<string, number> = {
  L: 1,
  X: 1,
  B: 1,
  I: 2,
  J: 4,
  K: 8,
  A: 1,
  E: 4,
  D: 8,
  C: 8,
  M: 16,
  P: 8,
  Q: 16,
};
const NUMERIC = new Set(['B', 'I', 'J', 'K', 'E', 'D']);

interface Column {
  name: string;
  type: string;
  repeat: number;
  offset: number;
  scale: number;
  zero: number;
  unit: string | null;
  ctype: string | null;
}

const fail = (message: string, hint: string): ProfileParse => ({
  ok: false,
  problems: [{ code: 'profile-fits', message, hint }],
});

const text = (v: FitsValue | undefined) => (typeof v === 'string' ? v.trim() : null);
const num = (v: FitsValue | undefined) => (typeof v === 'number' ? v : null);

function read(view: DataView, at: number, type: string): number {
  switch (type) {
    case 'B':
      return view.getUint8(at);
    case 'I':
      return view.getInt16(at, false);
    case 'J':
      return view.getInt32(at, false);
    case 'K':
      return Number(view.getBigInt64(at, false));
    case 'E':
      return view.getFloat32(at, false);
    default:
      return view.getFloat64(at, false);
  }
}

export function parseFitsTable(bytes: Uint8Array, start: number, name: string): ProfileParse {
  const head = parseFitsHeader(bytes, start);
  if (!head.ok)
    return fail(
      `${name}: no primary array, and the file ${head.message}`,
      'write the spectrum as the primary array or a binary table',
    );
  const h = head.header.values;
  if (text(h.get('XTENSION')) !== 'BINTABLE')
    return fail(
      `${name}: the first extension is ${text(h.get('XTENSION'))}, not BINTABLE`,
      'write the spectrum as the primary array or a binary table',
    );
  const rowBytes = num(h.get('NAXIS1')) ?? 0;
  const rows = num(h.get('NAXIS2')) ?? 0;
  const fields = num(h.get('TFIELDS')) ?? 0;
  const columns: Column[] = [];
  let offset = 0;
  for (let k = 1; k <= fields; k++) {
    const form = /^(\d*)([A-Z])/.exec(text(h.get(`TFORM${k}`)) ?? '');
    if (!form) return fail(`${name}: TFORM${k} cannot be read`, 'check the table header');
    const repeat = form[1] === '' ? 1 : Number(form[1]);
    const type = form[2]!;
    const size = TYPE_BYTES[type];
    if (size === undefined)
      return fail(`${name}: TFORM${k} type ${type} is not a FITS column type`, 'check the table header');
    columns.push({
      name: (text(h.get(`TTYPE${k}`)) ?? '').toUpperCase(),
      type,
      repeat,
      offset,
      scale: num(h.get(`TSCAL${k}`)) ?? 1,
      zero: num(h.get(`TZERO${k}`)) ?? 0,
      unit: text(h.get(`TUNIT${k}`)),
      ctype: text(h.get(`TCTYP${k}`)),
    });
    offset += type === 'X' ? Math.ceil(repeat / 8) : repeat * size;
  }
  if (offset !== rowBytes)
    return fail(
      `${name}: the columns take ${offset} bytes, NAXIS1 says ${rowBytes}`,
      'check the table header',
    );
  const pick = (names: string[]) => columns.find((c) => names.includes(c.name) && NUMERIC.has(c.type));
  const wave = pick(['WAVE', 'WAVELENGTH', 'LAMBDA']);
  const flux = pick(['FLUX', 'INTENSITY', 'COUNTS']);
  const err = pick(['ERR', 'ERROR', 'SIGMA', 'FLUX_ERR', 'UNCERTAINTY']);
  if (!wave || !flux)
    return fail(
      `${name}: the table has no numeric WAVE (or WAVELENGTH, LAMBDA) and FLUX (or INTENSITY, COUNTS) columns`,
      'name the columns so, or save the spectrum as CSV',
    );
  const nmPer = wave.unit === null ? undefined : NM_PER_FITS_UNIT[wave.unit];
  if (nmPer === undefined)
    return fail(
      `${name}: the wavelength column's unit (TUNIT) is ${wave.unit ?? 'not given'}`,
      "write TUNIT 'nm', 'Angstrom', 'um' or 'm' for it",
    );
  const vector = rows === 1 && wave.repeat > 1;
  const points = vector ? wave.repeat : rows;
  for (const c of [wave, flux, err].filter((c) => c !== undefined))
    if ((vector ? c.repeat : 1) !== (vector ? points : c.repeat))
      return fail(
        `${name}: column ${c.name} does not hold one value per point`,
        'give every column the same number of values',
      );
  if (points > MAX_PROFILE_POINTS)
    return fail(
      `${name} has ${points} points; the limit is ${MAX_PROFILE_POINTS}`,
      'cut the profile to the range of interest, or bin it',
    );
  const dataBytes = rowBytes * rows;
  if (bytes.length < head.header.dataOffset + dataBytes)
    return fail(`${name} is shorter than its table`, 'the file is cut short: save it again');
  const view = new DataView(bytes.buffer, bytes.byteOffset + head.header.dataOffset, dataBytes);
  const values = (c: Column) =>
    Array.from({ length: points }, (_, i) => {
      const at = vector ? c.offset + i * TYPE_BYTES[c.type]! : i * rowBytes + c.offset;
      return c.zero + c.scale * read(view, at, c.type);
    });
  const ctype = wave.ctype?.toUpperCase() ?? null;
  const medium = ctype === 'AWAV' ? 'air' : ctype === 'WAVE' ? 'vacuum' : null;
  return {
    ok: true,
    profile: {
      format: 'fits',
      axis: 'wavelength',
      x: values(wave).map((v) => v * nmPer),
      intensity: values(flux),
      sigma: err ? values(err) : null,
      medium,
      description: `FITS binary table, ${points} points (columns ${wave.name}, ${flux.name}${err ? `, ${err.name}` : ''}), wavelengths in ${wave.unit}${medium ? ` (${medium}, TCTYP ${ctype})` : ''}`,
    },
  };
}
