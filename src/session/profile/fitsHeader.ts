/**
 * The part of the FITS Standard 4.0 (IAU FITS Working Group, 2016) a 1-D spectrum needs:
 * the primary header as 80-character keyword records in 2880-byte blocks, and its values.
 * Section numbers below are those of the Standard 4.0 as we recall them ("from memory").
 *
 * No npm FITS reader fitted: fitsjs (0.6.6) reads through browser File/Blob callbacks and
 * fits-reader-js (1.0.0) is a single unmaintained release; the subset we need is small.
 */

/** §3.1: a FITS file is a sequence of 2880-byte blocks (records). */
export const FITS_BLOCK_BYTES = 2880;
/** §4.1.1: each header keyword record is 80 ASCII characters. */
export const FITS_CARD_CHARS = 80;

export type FitsValue = string | number | boolean | null;

export interface FitsHeader {
  /** Keyword → value of its first occurrence (later duplicates are ignored). */
  values: Map<string, FitsValue>;
  /** Byte offset of the first data block after the END record's block. */
  dataOffset: number;
}

export type HeaderParse = { ok: true; header: FitsHeader } | { ok: false; message: string };

/**
 * One value field (§4.2): a character string in single quotes with '' for a quote and trailing
 * spaces not significant (§4.2.1), a logical T or F in column 30 or anywhere in free format
 * (§4.2.2), an integer (§4.2.3) or a real with an E or D exponent (§4.2.4); a `/` starts the comment.
 */
export function parseFitsValue(field: string): FitsValue | undefined {
  const t = field.trimStart();
  if (t.startsWith("'")) {
    let out = '';
    for (let i = 1; i < t.length; i++) {
      const c = t[i];
      if (c === "'") {
        if (t[i + 1] === "'") {
          out += "'";
          i++;
          continue;
        }
        return out.replace(/ +$/, '');
      }
      out += c;
    }
    return undefined; // no closing quote
  }
  const raw = t.replace(/\/.*$/, '').trim();
  if (raw === '') return null; // an undefined value (§4.1.2.3)
  if (raw === 'T') return true;
  if (raw === 'F') return false;
  if (/^[+-]?\d+$/.test(raw)) return Number(raw);
  if (/^[+-]?(\d+\.?\d*|\.\d+)([ED][+-]?\d+)?$/.test(raw)) return Number(raw.replace('D', 'E'));
  return undefined;
}

/**
 * A header: cards until END (§4.4.1), the data starting at the next block boundary. The
 * primary header (at 0) starts with SIMPLE = T; an extension's (§7.1, at a block boundary)
 * with XTENSION.
 */
export function parseFitsHeader(bytes: Uint8Array, start = 0): HeaderParse {
  const values = new Map<string, FitsValue>();
  const cards = Math.floor((bytes.length - start) / FITS_CARD_CHARS);
  for (let n = 0; n < cards; n++) {
    let card = '';
    for (let i = start + n * FITS_CARD_CHARS; i < start + (n + 1) * FITS_CARD_CHARS; i++) {
      const b = bytes[i]!;
      // §4.1.1: only the printable ASCII characters (hex 20 to 7E) may appear in a header.
      if (b < 0x20 || b > 0x7e)
        return { ok: false, message: `header record ${n + 1} holds a byte that is not printable ASCII` };
      card += String.fromCharCode(b);
    }
    if (n === 0 && start === 0 && !/^SIMPLE {2}= +T/.test(card))
      return { ok: false, message: 'does not start with SIMPLE = T: it is not a FITS file' };
    if (n === 0 && start > 0 && !card.startsWith('XTENSION= '))
      return { ok: false, message: 'has no extension header where the primary data end' };
    // §4.1.2.1: the keyword name is columns 1–8, left-justified, padded with spaces.
    const keyword = card.slice(0, 8).trimEnd();
    if (keyword === 'END') {
      const headerBytes = (n + 1) * FITS_CARD_CHARS;
      const dataOffset = start + Math.ceil(headerBytes / FITS_BLOCK_BYTES) * FITS_BLOCK_BYTES;
      return { ok: true, header: { values, dataOffset } };
    }
    // §4.1.2.2: "= " in columns 9–10 marks a value; COMMENT, HISTORY and blank keywords have none.
    if (card.slice(8, 10) !== '= ') continue;
    const value = parseFitsValue(card.slice(10));
    if (value === undefined)
      return { ok: false, message: `the value of ${keyword} (header record ${n + 1}) cannot be read` };
    if (!values.has(keyword)) values.set(keyword, value);
  }
  return { ok: false, message: 'the header has no END record: the file is cut short or not FITS' };
}

/** Units of a wavelength axis CUNIT1 may give (§4.3, Table 26 of the Standard), in nm. */
export const NM_PER_FITS_UNIT: Record<string, number> = {
  m: 1e9,
  cm: 1e7,
  mm: 1e6,
  um: 1e3,
  nm: 1,
  Angstrom: 0.1,
  angstrom: 0.1,
};
