/**
 * A 1-D spectrum in the primary array of a FITS file: the data (§5 of the FITS Standard 4.0,
 * big-endian, BITPIX 8, 16, 32, −32 or −64), scaled by BZERO and BSCALE with BLANK for
 * undefined integers (§4.4.2.5), and the wavelength of each pixel from the linear world
 * coordinate keywords CRVAL1, CRPIX1 and CDELT1 or CD1_1 (§8.1–8.2; CD1_1 wins when both are
 * written). CTYPE1 WAVE means vacuum and AWAV air wavelengths (Greisen et al. 2006, A&A 446,
 * 747, "Paper III", §2 and Table 1), whose default unit is the metre; CUNIT1 may say otherwise.
 * Section numbers are recalled ("from memory").
 */

import { MAX_PROFILE_POINTS } from './check.js';
import { type FitsValue, NM_PER_FITS_UNIT, parseFitsHeader } from './fitsHeader.js';
import { parseFitsTable } from './fitsTable.js';
import type { ProfileParse, ProfileProblem } from './types.js';

function problem(message: string, hint: string): ProfileParse {
  return { ok: false, problems: [{ code: 'profile-fits', message, hint }] satisfies ProfileProblem[] };
}

const num = (v: FitsValue | undefined): number | null => (typeof v === 'number' ? v : null);

export function parseFitsProfile(bytes: Uint8Array, name: string): ProfileParse {
  const head = parseFitsHeader(bytes);
  if (!head.ok)
    return problem(`${name} ${head.message}`, 'save the spectrum as a FITS file with a 1-D primary array');
  const h = head.header.values;
  const bitpix = num(h.get('BITPIX'));
  const naxis = num(h.get('NAXIS'));
  if (bitpix === null || ![8, 16, 32, -32, -64].includes(bitpix))
    return problem(
      `${name}: BITPIX ${String(h.get('BITPIX'))} is not one the Standard allows here`,
      'use BITPIX 8, 16, 32, -32 or -64',
    );
  // No primary array: the spectrum may be in a binary table, the first extension (§7.3).
  if (naxis === 0) return parseFitsTable(bytes, head.header.dataOffset, name);
  if (naxis === null || naxis < 1)
    return problem(
      `${name} has no primary array (NAXIS = ${String(naxis)})`,
      'write the spectrum as the primary array; tables are not read by this version',
    );
  const n1 = num(h.get('NAXIS1'));
  if (n1 === null || n1 < 1)
    return problem(`${name}: NAXIS1 is missing or 0`, 'write NAXIS1, the number of points');
  for (let k = 2; k <= naxis; k++) {
    if (num(h.get(`NAXIS${k}`)) !== 1)
      return problem(
        `${name}: the primary array has more than one dimension (NAXIS${k} ≠ 1)`,
        'write a 1-D spectrum: extract it first',
      );
  }
  if (n1 > MAX_PROFILE_POINTS)
    return problem(
      `${name} has ${n1} points; the limit is ${MAX_PROFILE_POINTS}`,
      'cut the profile to the range of interest, or bin it',
    );
  const size = Math.abs(bitpix) / 8;
  const offset = head.header.dataOffset;
  if (bytes.length < offset + n1 * size)
    return problem(
      `${name} holds ${bytes.length} bytes, fewer than its header's ${n1} points need`,
      'the file is cut short: save it again',
    );
  const view = new DataView(bytes.buffer, bytes.byteOffset + offset, n1 * size);
  const bzero = num(h.get('BZERO')) ?? 0;
  const bscale = num(h.get('BSCALE')) ?? 1;
  const blank = bitpix > 0 ? num(h.get('BLANK')) : null;
  const intensity: number[] = new Array(n1);
  for (let i = 0; i < n1; i++) {
    // §5: big-endian two's-complement integers (8-bit unsigned) and IEEE-754 floats.
    const raw =
      bitpix === 8
        ? view.getUint8(i)
        : bitpix === 16
          ? view.getInt16(i * 2, false)
          : bitpix === 32
            ? view.getInt32(i * 4, false)
            : bitpix === -32
              ? view.getFloat32(i * 4, false)
              : view.getFloat64(i * 8, false);
    intensity[i] = blank !== null && raw === blank ? Number.NaN : bzero + bscale * raw;
  }

  const ctype = h.get('CTYPE1');
  const type = typeof ctype === 'string' ? ctype.trim() : null;
  // §8.1: pixel numbers count from 1 at the centre of the first pixel.
  const pixels = Array.from({ length: n1 }, (_, i) => i + 1);
  if (type === null || type === '' || type === 'PIXEL')
    return {
      ok: true,
      profile: {
        format: 'fits',
        axis: 'pixel',
        x: pixels,
        intensity,
        sigma: null,
        medium: null,
        description: `FITS primary array, ${n1} points, BITPIX ${bitpix}, pixels numbered from 1 (no CTYPE1)`,
      },
    };
  if (type !== 'WAVE' && type !== 'AWAV')
    return problem(
      `${name}: CTYPE1 '${type}' is not a linear wavelength axis this version reads`,
      "use CTYPE1 'WAVE' (vacuum) or 'AWAV' (air), or no CTYPE1 for a pixel axis",
    );
  const crval = num(h.get('CRVAL1'));
  const crpix = num(h.get('CRPIX1')) ?? 0; // Paper I: CRPIXj defaults to 0.0 (from memory)
  const delta = num(h.get('CD1_1')) ?? num(h.get('CDELT1'));
  if (crval === null || delta === null || delta === 0)
    return problem(
      `${name}: CTYPE1 ${type} needs CRVAL1 and a non-zero CDELT1 or CD1_1`,
      'write the wavelength of the reference pixel and the step per pixel',
    );
  const cunit = h.get('CUNIT1');
  const unit = typeof cunit === 'string' && cunit.trim() !== '' ? cunit.trim() : 'm';
  const nmPer = NM_PER_FITS_UNIT[unit];
  if (nmPer === undefined)
    return problem(
      `${name}: CUNIT1 '${unit}' is not a length unit this version reads`,
      "use 'm', 'nm', 'um' or 'Angstrom'",
    );
  const x = pixels.map((p) => (crval + delta * (p - crpix)) * nmPer);
  return {
    ok: true,
    profile: {
      format: 'fits',
      axis: 'wavelength',
      x,
      intensity,
      sigma: null,
      medium: type === 'AWAV' ? 'air' : 'vacuum',
      description: `FITS primary array, ${n1} points, BITPIX ${bitpix}, CTYPE1 ${type} (${type === 'AWAV' ? 'air' : 'vacuum'}), CUNIT1 ${unit}`,
    },
  };
}
