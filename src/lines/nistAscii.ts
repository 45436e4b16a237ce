/**
 * The NIST ASD lines form's fixed-width "ASCII (text)" output → header and data rows in the
 * shape of its tab-delimited output, so src/lines/nistImport.ts reads both with one set of rules.
 *
 * The ASCII table: columns separated by `|`; a header of two or three rows (Observed /
 * Wavelength / Vac (Å), Ritz …, Rel. Int., Type, …), closed by a row of dashes; empty separator
 * rows (every cell blank) between groups of lines; level columns split into Conf. | Term | J in
 * the header's last row and in the data. Copies of the table often comment the header rows out
 * with `#`; both forms are read. Pure: text in, rows out.
 */

export interface TableRow {
  /** 1-based line of the text. */
  line: number;
  cells: string[];
  /** 0-based character offset of each cell in its line. */
  starts: number[];
}

/** A header row of the ASCII table: its first row names the Observed or Ritz wavelength. */
const HEADER_START = /\b(Observed|Ritz)\b/;
const DASHES = /^#?\s*-{10,}\s*$/;

/** Cells of a row split at `separator`, with each cell's start column (for diagnostics). */
export function splitAt(text: string, separator: string): { cells: string[]; starts: number[] } {
  const cells = text.split(separator);
  const starts: number[] = [];
  let at = 0;
  for (const c of cells) {
    starts.push(at);
    at += c.length + separator.length;
  }
  return { cells, starts };
}

/** Whether the text is the ASCII table (rather than tab-delimited or CSV). */
export function isAsciiTable(lines: readonly string[]): boolean {
  return lines.some((l) => l.includes('|') && HEADER_START.test(l));
}

/** `Observed Wavelength Vac (Å)` → `obs_wl_vac(A)`; `Rel. Int. (?)` → `intens`; … (delimited names). */
function columnName(words: string, previous: string | null): string {
  const unit = /\((Å|A|nm|µm|μm|um)\)/.exec(words)?.[1];
  const unitName = unit === 'Å' ? 'A' : unit;
  const medium = /\bVac\b/i.test(words) ? '_vac' : /\bAir\b/i.test(words) ? '_air' : '';
  if (/^Observed\b/.test(words)) return `obs_wl${medium}(${unitName ?? '?'})`;
  if (/^Ritz\b/.test(words)) return `ritz_wl${medium}(${unitName ?? '?'})`;
  // "O Unc." / "R Unc." say whose uncertainty; a bare "Unc." follows the wavelength it belongs to.
  if (/^O\s*Unc\./.test(words)) return 'unc_obs_wl';
  if (/^R\s*Unc\./.test(words)) return 'unc_ritz_wl';
  if (/^Unc\./.test(words)) return previous?.startsWith('ritz') ? 'unc_ritz_wl' : 'unc_obs_wl';
  if (/^Rel\.\s*Int/.test(words)) return 'intens';
  if (/^Type\b/.test(words)) return 'Type';
  if (/^Aki\b/.test(words)) return 'Aki(s^-1)';
  return words;
}

/**
 * The header rows, merged column by column: the row with the most cells sets the columns; a
 * wider cell of another row (Lower level over Conf. | Term | J) names each column it covers.
 */
function headerNames(rows: readonly string[]): { names: string[]; starts: number[] } {
  const parts = rows.map((r) => splitAt(r, '|'));
  const widest = parts.reduce((a, b) => (b.cells.length > a.cells.length ? b : a));
  const names: string[] = [];
  let previous: string | null = null;
  widest.cells.forEach((_, k) => {
    const mid = (widest.starts[k] as number) + 0.5;
    const words = parts
      .map((p) => {
        let j = 0;
        while (j + 1 < p.starts.length && (p.starts[j + 1] as number) <= mid) j++;
        return (p.cells[j] ?? '').trim();
      })
      .filter((w) => w !== '' && !/^-+$/.test(w))
      .join(' ');
    const name = columnName(words, previous);
    if (/^(obs|ritz)_wl/.test(name)) previous = name;
    names.push(name);
  });
  return { names, starts: widest.starts };
}

function pipes(text: string): Set<number> {
  const out = new Set<number>();
  for (let k = 0; k < text.length; k++) if (text[k] === '|') out.add(k);
  return out;
}

/**
 * A header row commented out with `#`: copies either put the `#` in place of a space or in
 * front of the row (shifting it by one). The reading whose `|` fall on the first row's wins.
 */
function uncomment(row: string, first: string): string {
  if (!row.startsWith('#')) return row;
  const reference = pipes(first);
  const score = (t: string) => [...pipes(t)].filter((k) => reference.has(k)).length;
  const replaced = ` ${row.slice(1)}`;
  const shifted = row.slice(1);
  return score(shifted) > score(replaced) ? shifted : replaced;
}

/**
 * Header rows (with delimited-style names, at the line of the header's first row) and data
 * rows, in order. Separator rows, dashes, comments and text outside a table are left out.
 */
export function asciiTableRows(lines: readonly string[]): TableRow[] {
  const out: TableRow[] = [];
  let i = 0;
  let inTable = false;
  while (i < lines.length) {
    const raw = lines[i] as string;
    const text = raw.replace(/^#/, ' ');
    if (text.includes('|') && HEADER_START.test(text)) {
      const headerLine = i + 1;
      const rows: string[] = [text];
      i++;
      while (i < lines.length && !DASHES.test(lines[i] as string) && (lines[i] as string).includes('|')) {
        rows.push(uncomment(lines[i] as string, text));
        i++;
      }
      const { names, starts } = headerNames(rows);
      out.push({ line: headerLine, cells: names, starts });
      inTable = true;
      continue;
    }
    i++;
    if (!inTable || raw.startsWith('#') || !raw.includes('|')) continue;
    const { cells, starts } = splitAt(raw, '|');
    if (cells.every((c) => c.trim() === '')) continue; // separator row between groups
    out.push({ line: i, cells, starts });
  }
  return out;
}
