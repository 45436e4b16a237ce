/**
 * data/lines/conditions.tsv → line strengths per condition, joined onto the catalog's rows.
 *
 * The lab intensities of the line files are discharge-lamp strengths; a flame, a nebula or a
 * star's absorption shows other lines strongest. This file gives, for lines the catalog holds,
 * their strength under one of those conditions (columns: species, vacuum_nm, condition,
 * strength, source, origin). A row belongs to the catalog row of the same species whose vacuum
 * wavelength is nearest, within CONDITION_MATCH_NM; a row that finds none is an error, not a
 * silent drop. Pure: text in, problems out at file:line:col.
 */

import { eachTsvRow, type TsvProblem } from './tsv.js';
import {
  type CatalogFile,
  LINE_CONDITIONS,
  LINE_ORIGINS,
  type LineCondition,
  type LineOrigin,
  type SourceCitation,
} from './types.js';

export const CONDITION_COLUMNS = ['species', 'vacuum_nm', 'condition', 'strength', 'source', 'origin'];

/**
 * How far a condition row's wavelength may sit from its catalog row. The file copies the
 * catalog's vacuum wavelengths, so this only absorbs rounding; it is far below the closest
 * pairs of distinct lines of one species the tables use (He I 587.725/587.760 nm, 0.035 nm).
 */
export const CONDITION_MATCH_NM = 0.01;

export interface ConditionRow {
  species: string;
  vacuum_nm: number;
  condition: LineCondition;
  strength: number;
  source: string;
  origin: LineOrigin;
  file: string;
  line: number;
}

type Problem = TsvProblem;

export function parseConditionFile(
  file: CatalogFile,
  sources: ReadonlyMap<string, SourceCitation>,
  problem: Problem,
): ConditionRow[] {
  const rows: ConditionRow[] = [];
  eachTsvRow(file, CONDITION_COLUMNS, problem, ({ cells, line: lineNo, col }) => {
    const [species, vac, condition, strength, source, origin] = cells as [
      string,
      string,
      string,
      string,
      string,
      string,
    ];
    let ok = true;
    const bad = (k: number, field: string, message: string) => {
      problem(file.name, lineNo, col(k), field, message);
      ok = false;
    };
    const positive = (s: string, k: number, field: string): number => {
      const v = Number(s);
      if (!/^\d+(\.\d+)?$/.test(s) || !(v > 0)) bad(k, field, `"${s}" is not a positive decimal number`);
      return v;
    };
    if (!/^\S.*\S$|^\S$/.test(species)) bad(0, 'species', 'species is empty or padded');
    const vacuum_nm = positive(vac, 1, 'vacuum_nm');
    if (!(LINE_CONDITIONS as readonly string[]).includes(condition))
      bad(
        2,
        'condition',
        condition === 'lab'
          ? "lab strengths are the line files' intensity column, not rows of this file"
          : `condition must be ${LINE_CONDITIONS.join(', ')}`,
      );
    const value = positive(strength, 3, 'strength');
    if (!sources.has(source)) bad(4, 'source', `source key "${source}" is not in sources.yaml`);
    if (!(LINE_ORIGINS as readonly string[]).includes(origin))
      bad(5, 'origin', `origin must be ${LINE_ORIGINS.join(', ')}`);
    if (!ok) return;
    rows.push({
      species,
      vacuum_nm,
      condition: condition as LineCondition,
      strength: value,
      source,
      origin: origin as LineOrigin,
      file: file.name,
      line: lineNo,
    });
  });
  return rows;
}

/**
 * Join condition rows onto each species' sorted wavelengths: per species and condition, an
 * array aligned with its rows (NaN where the table is silent).
 */
export function joinConditions(
  rows: readonly ConditionRow[],
  wavelengthsOf: (species: string) => Float64Array | undefined,
  problem: Problem,
): Map<string, Map<LineCondition, Float64Array>> {
  const out = new Map<string, Map<LineCondition, Float64Array>>();
  const taken = new Map<string, ConditionRow>();
  for (const row of rows) {
    const col = 1 + row.species.length + 1;
    const vac = wavelengthsOf(row.species);
    if (!vac) {
      problem(row.file, row.line, 1, 'species', `no line list holds species "${row.species}"`);
      continue;
    }
    let best = -1;
    let bestDist = Number.POSITIVE_INFINITY;
    for (let k = 0; k < vac.length; k++) {
      const d = Math.abs((vac[k] as number) - row.vacuum_nm);
      if (d < bestDist) {
        bestDist = d;
        best = k;
      }
    }
    if (best < 0 || bestDist > CONDITION_MATCH_NM) {
      problem(
        row.file,
        row.line,
        col,
        'vacuum_nm',
        `no ${row.species} line of the catalog lies within ${CONDITION_MATCH_NM} nm of ${row.vacuum_nm} nm`,
      );
      continue;
    }
    const key = `${row.species}\t${best}\t${row.condition}`;
    const earlier = taken.get(key);
    if (earlier) {
      problem(
        row.file,
        row.line,
        col,
        'vacuum_nm',
        `the same ${row.species} line already has a ${row.condition} strength (${earlier.file}:${earlier.line})`,
      );
      continue;
    }
    taken.set(key, row);
    const bySpecies = out.get(row.species) ?? new Map<LineCondition, Float64Array>();
    const values = bySpecies.get(row.condition) ?? new Float64Array(vac.length).fill(Number.NaN);
    values[best] = row.strength;
    bySpecies.set(row.condition, values);
    out.set(row.species, bySpecies);
  }
  return out;
}
