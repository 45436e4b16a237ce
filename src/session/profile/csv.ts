/**
 * Delimited text profiles: columns of position (pixel or wavelength), intensity and an
 * optional uncertainty, as spectrometer software and spreadsheets save them. Commas, tabs,
 * semicolons or runs of spaces separate the columns; `#` starts a comment; a first row that is
 * not numbers is a header. A CSV library (csv-parse, d3-dsv) was considered, but neither takes
 * space-separated columns or comment lines as such files have them, and the numbers-only
 * grammar here is a dozen lines.
 */
import type { ProfileAxis, ProfileParse, ProfileProblem } from './types.js';

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

function splitRow(row: string): string[] {
  const t = row.trim();
  if (/[,;\t]/.test(t)) return t.split(/\s*[,;\t]\s*/);
  return t.split(/\s+/);
}

export interface CsvOptions {
  axis: ProfileAxis;
  /** nm per unit of the wavelength column (1 for nm); ignored for pixel axes. */
  nmPerUnit: number;
  name: string;
}

export function parseDelimitedProfile(text: string, options: CsvOptions): ProfileParse {
  const problems: ProfileProblem[] = [];
  const x: number[] = [];
  const y: number[] = [];
  const s: number[] = [];
  let columns = 0;
  let header = false;
  const rows = text.replace(/^\ufeff/, '').split(/\r\n|\r|\n/);
  for (let i = 0; i < rows.length && problems.length < 5; i++) {
    const row = rows[i]!.replace(/#.*$/, '');
    if (row.trim() === '') continue;
    const cells = splitRow(row);
    const numeric = cells.every((c) => NUMBER.test(c));
    if (!numeric) {
      if (x.length === 0 && !header) {
        header = true;
        continue;
      }
      problems.push({
        code: 'profile-bad-row',
        message: `${options.name} line ${i + 1} is not a row of numbers: ${JSON.stringify(row.trim().slice(0, 60))}`,
        hint: 'each row holds position, intensity and optionally its uncertainty, as plain numbers',
      });
      continue;
    }
    if (columns === 0) columns = cells.length;
    if (cells.length !== columns || cells.length < 2 || cells.length > 3) {
      problems.push({
        code: 'profile-bad-row',
        message: `${options.name} line ${i + 1} has ${cells.length} columns; the first row of numbers had ${columns}`,
        hint: 'use 2 columns (position, intensity) or 3 (position, intensity, uncertainty) on every row',
      });
      continue;
    }
    const scale = options.axis === 'wavelength' ? options.nmPerUnit : 1;
    x.push(Number(cells[0]) * scale);
    y.push(Number(cells[1]));
    if (cells.length === 3) s.push(Number(cells[2]));
  }
  if (problems.length > 0) return { ok: false, problems };
  return {
    ok: true,
    profile: {
      format: 'csv',
      axis: options.axis,
      x,
      intensity: y,
      sigma: columns === 3 ? s : null,
      medium: null,
      description: `${x.length} rows of ${options.axis === 'pixel' ? 'pixel' : 'wavelength'}, intensity${columns === 3 ? ', uncertainty' : ''}`,
    },
  };
}
