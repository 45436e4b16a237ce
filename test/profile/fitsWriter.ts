/**
 * FITS files written by hand for the tests, following the FITS Standard 4.0 (from memory):
 * 80-character keyword records (§4.1.1), the value indicator "= " in columns 9–10 (§4.1.2.2),
 * fixed-format values right-justified to column 30 (§4.2), the header padded with spaces and
 * the data with zeros to whole 2880-byte blocks (§3.3.1–3.3.2), big-endian data (§5).
 */
export type Card = [keyword: string, value: string | number | boolean] | [raw: string];

export function card(keyword: string, value: string | number | boolean): string {
  let v: string;
  if (typeof value === 'string') {
    // §4.2.1: a string starts in column 11, quotes doubled, padded to at least 8 characters.
    v = `'${value.replace(/'/g, "''").padEnd(8)}'`;
  } else if (typeof value === 'boolean') v = (value ? 'T' : 'F').padStart(20);
  else v = String(value).toUpperCase().padStart(20); // §4.2.4: the exponent letter is E (or D)
  return `${keyword.padEnd(8)}= ${v}`.padEnd(80).slice(0, 80);
}

export function header(cards: Card[]): string {
  const text =
    cards.map((c) => (c.length === 1 ? c[0].padEnd(80) : card(c[0], c[1]))).join('') + 'END'.padEnd(80);
  return text.padEnd(Math.ceil(text.length / 2880) * 2880, ' ');
}

export function fitsFile(cards: Card[], bitpix: 8 | 16 | 32 | -32 | -64, values: number[]): Uint8Array {
  const head = new TextEncoder().encode(header(cards));
  const size = Math.abs(bitpix) / 8;
  const dataBytes = Math.ceil((values.length * size) / 2880) * 2880;
  const out = new Uint8Array(head.length + dataBytes);
  out.set(head, 0);
  const view = new DataView(out.buffer, head.length);
  values.forEach((v, i) => {
    if (bitpix === 8) view.setUint8(i, v);
    else if (bitpix === 16) view.setInt16(i * 2, v, false);
    else if (bitpix === 32) view.setInt32(i * 4, v, false);
    else if (bitpix === -32) view.setFloat32(i * 4, v, false);
    else view.setFloat64(i * 8, v, false);
  });
  return out;
}

/** The mandatory primary keywords in their required order (§4.4.1.1): SIMPLE, BITPIX, NAXIS, NAXIS1. */
export function primary(bitpix: number, n: number, extra: Card[] = []): Card[] {
  return [['SIMPLE', true], ['BITPIX', bitpix], ['NAXIS', 1], ['NAXIS1', n], ...extra];
}

/** A column of a binary table: TFORM type E (float32), D (float64) or I (int16), repeat r. */
export interface TableColumn {
  name: string;
  type: 'E' | 'D' | 'I';
  unit?: string;
  ctype?: string;
  scale?: number;
  zero?: number;
  /** One array per row (repeat = its length). */
  rows: number[][];
}

const SIZE = { E: 4, D: 8, I: 2 } as const;

/**
 * An empty primary HDU followed by a BINTABLE extension (§7.3): the mandatory keywords in
 * their order (XTENSION, BITPIX = 8, NAXIS = 2, NAXIS1 = bytes per row, NAXIS2 = rows,
 * PCOUNT = 0, GCOUNT = 1, TFIELDS), then TTYPEn/TFORMn/TUNITn per column; big-endian rows.
 */
export function fitsTableFile(columns: TableColumn[]): Uint8Array {
  const rows = columns[0]!.rows.length;
  const repeat = columns.map((c) => c.rows[0]!.length);
  const rowBytes = columns.reduce((s, c, k) => s + SIZE[c.type] * repeat[k]!, 0);
  const cards: Card[] = [
    ['XTENSION', 'BINTABLE'],
    ['BITPIX', 8],
    ['NAXIS', 2],
    ['NAXIS1', rowBytes],
    ['NAXIS2', rows],
    ['PCOUNT', 0],
    ['GCOUNT', 1],
    ['TFIELDS', columns.length],
  ];
  columns.forEach((c, k) => {
    cards.push([`TTYPE${k + 1}`, c.name], [`TFORM${k + 1}`, `${repeat[k]}${c.type}`]);
    if (c.unit) cards.push([`TUNIT${k + 1}`, c.unit]);
    if (c.ctype) cards.push([`TCTYP${k + 1}`, c.ctype]);
    if (c.scale !== undefined) cards.push([`TSCAL${k + 1}`, c.scale]);
    if (c.zero !== undefined) cards.push([`TZERO${k + 1}`, c.zero]);
  });
  const primaryHead = new TextEncoder().encode(
    header([
      ['SIMPLE', true],
      ['BITPIX', 8],
      ['NAXIS', 0],
      ['EXTEND', true],
    ]),
  );
  const extHead = new TextEncoder().encode(header(cards));
  const dataBytes = Math.ceil((rowBytes * rows) / 2880) * 2880;
  const out = new Uint8Array(primaryHead.length + extHead.length + dataBytes);
  out.set(primaryHead, 0);
  out.set(extHead, primaryHead.length);
  const view = new DataView(out.buffer, primaryHead.length + extHead.length);
  let at = 0;
  for (let r = 0; r < rows; r++)
    columns.forEach((c) => {
      for (const v of c.rows[r]!) {
        if (c.type === 'E') view.setFloat32(at, v, false);
        else if (c.type === 'D') view.setFloat64(at, v, false);
        else view.setInt16(at, v, false);
        at += SIZE[c.type];
      }
    });
  return out;
}
