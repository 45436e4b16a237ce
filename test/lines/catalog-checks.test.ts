/**
 * Checks on the bundled catalog's data (issue 4): the raw rows of data/lines/*.tsv as written,
 * the groups, well-known lines against NIST ASD, and how well each required species is covered.
 * test/catalog.test.ts has the loaded-catalog basics and the first NIST lines; not repeated here.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse as parseYaml } from 'yaml';
import { CONDITIONS_FILE } from '../../src/lines/load.js';
import { CATALOG_COLUMNS } from '../../src/lines/parse.js';
import { windowRange } from '../../src/lines/search.js';
import { vacuumToAir } from '../../src/reduce/airVacuum.js';
import { bundledCatalog } from '../helpers/catalog.js';

const catalog = bundledCatalog();
const LINES_DIR = join('data', 'lines');

interface RawRow {
  where: string;
  species: string;
  vacuum: string;
  air: string;
  cells: string[];
}

/** The rows exactly as the files hold them (the loader sorts per species; the files must be sorted too). */
function rawRows(): Map<string, RawRow[]> {
  const out = new Map<string, RawRow[]>();
  // conditions.tsv holds strengths for these rows, not rows (test/lines/conditions.test.ts).
  for (const name of readdirSync(LINES_DIR).filter((n) => n.endsWith('.tsv') && n !== CONDITIONS_FILE)) {
    const rows: RawRow[] = [];
    let header = false;
    readFileSync(join(LINES_DIR, name), 'utf8')
      .split(/\r?\n/)
      .forEach((text, i) => {
        if (text.trim() === '' || text.startsWith('#')) return;
        if (!header) {
          header = true;
          return;
        }
        const cells = text.split('\t');
        rows.push({
          where: `${name}:${i + 1}`,
          species: cells[0] as string,
          vacuum: cells[1] as string,
          air: cells[2] as string,
          cells,
        });
      });
    out.set(name, rows);
  }
  return out;
}

const files = rawRows();
const allRows = [...files.values()].flat();

describe('catalog rows as written', () => {
  it('has rows in every file, each with all columns', () => {
    expect(files.size).toBeGreaterThanOrEqual(1);
    for (const [name, rows] of files) {
      expect(rows.length, name).toBeGreaterThan(0);
      for (const r of rows) expect(r.cells.length, r.where).toBe(CATALOG_COLUMNS.length);
    }
  });

  it('keeps each file sorted by species, then vacuum wavelength', () => {
    for (const [, rows] of files) {
      for (let k = 1; k < rows.length; k++) {
        const a = rows[k - 1] as RawRow;
        const b = rows[k] as RawRow;
        const ordered =
          a.species < b.species || (a.species === b.species && Number(a.vacuum) < Number(b.vacuum));
        expect(ordered, `${b.where} (${b.species} ${b.vacuum}) after ${a.species} ${a.vacuum}`).toBe(true);
      }
    }
  });

  it('has no line twice, across files (same species within 0.001 nm)', () => {
    const bySpecies = new Map<string, RawRow[]>();
    for (const r of allRows) bySpecies.set(r.species, [...(bySpecies.get(r.species) ?? []), r]);
    for (const [species, rows] of bySpecies) {
      const sorted = [...rows].sort((a, b) => Number(a.vacuum) - Number(b.vacuum));
      for (let k = 1; k < sorted.length; k++) {
        const gap = Number(sorted[k]?.vacuum) - Number(sorted[k - 1]?.vacuum);
        expect(gap, `${species}: ${sorted[k - 1]?.where} and ${sorted[k]?.where}`).toBeGreaterThan(0.001);
      }
    }
  });

  it('writes "-" for air exactly where the vacuum wavelength is below 200 nm (IAU convention, Morton 2000)', () => {
    for (const r of allRows)
      expect(r.air === '-', `${r.where} ${r.vacuum} ${r.air}`).toBe(Number(r.vacuum) < 200);
  });

  it('has air wavelengths that the IAU formula gives from the vacuum ones to 0.002 nm, row by row', () => {
    for (const r of allRows) {
      if (r.air === '-') continue;
      const diff = Math.abs(vacuumToAir(Number(r.vacuum)) - Number(r.air));
      expect(diff, `${r.where}: ${r.species} ${r.vacuum} vac / ${r.air} air`).toBeLessThan(0.002);
    }
  });

  it('names an origin (read, memory or computed) and a cited source on every row', () => {
    for (const r of allRows) {
      expect(['read', 'memory', 'computed'], r.where).toContain(r.cells[7]);
      expect(catalog.sources.get(r.cells[6] as string)?.citation, r.where).toMatch(/\S{10}/);
    }
  });
});

describe('groups', () => {
  const groups = parseYaml(readFileSync(join('data', 'groups.yaml'), 'utf8')) as {
    groups: Record<string, { species: string[] }>;
    defaults_by_source_kind: Record<string, string[]>;
  };

  // The loader drops unknown species from a group silently, so check the file itself.
  it('lists only species the catalog has', () => {
    for (const [id, g] of Object.entries(groups.groups))
      for (const s of g.species) expect(catalog.species.has(s), `${id}: ${s}`).toBe(true);
  });

  it('defaults every source kind to groups that exist', () => {
    for (const [kind, ids] of Object.entries(groups.defaults_by_source_kind))
      for (const id of ids) expect(Object.keys(groups.groups), `${kind}: ${id}`).toContain(id);
  });
});

function nearestAir(species: string, air_nm: number): number {
  const l = catalog.species.get(species);
  if (!l) throw new Error(`no ${species}`);
  let best = Number.POSITIVE_INFINITY;
  for (const a of l.air_nm) if (Math.abs(a - air_nm) < Math.abs(best - air_nm)) best = a;
  return best;
}

// NIST ASD air wavelengths (Kramida, Ralchenko, Reader & NIST ASD Team, NIST Atomic Spectra
// Database), as issue 4 lists them; Na, Hg, He, Ne and H are in test/catalog.test.ts.
const NIST_AIR_MORE: [string, number][] = [
  ['Ca II', 393.366],
  ['Ca II', 396.847],
  ['Li I', 670.78],
];

describe('well-known lines (NIST ASD, air nm)', () => {
  it.each(NIST_AIR_MORE)('holds %s %f nm to 0.005 nm', (species, air) => {
    expect(Math.abs(nearestAir(species, air) - air)).toBeLessThan(0.005);
  });
});

/** Issue 4's required species. */
const REQUIRED = [
  'H I',
  'He I',
  'Ne I',
  'Ar I',
  'Ar II',
  'Kr I',
  'Xe I',
  'Hg I',
  'Na I',
  'O I',
  'N I',
  'Cd I',
  'Zn I',
  'Tl I',
  'In I',
  'Sc I',
  'N2',
  'N2+',
  'Li I',
  'K I',
  'Rb I',
  'Cs I',
  'Ca I',
  'Sr I',
  'Ba I',
  'Cu I',
  'He II',
  'Mg I',
  'Mg II',
  'Ca II',
  'Fe I',
  'Fe II',
  'Ti II',
  'Sr II',
  'Cr I',
  'Si II',
  'C II',
  'C III',
  'C IV',
  'N III',
  'CH',
  'CN',
  'C2',
  'TiO',
];
/** The coverage rule (docs/catalog.md): ≥ 3 lines in 350–1000 nm (vacuum), Fe I ≥ 60 there. */
const VISIBLE_NM: [number, number] = [350, 1000];
const MIN_LINES = 3;
const MIN_FE_I = 60;
/**
 * Species whose own range reaches below 350 nm, counted over the whole catalog instead:
 * In I (its resonance lines are at 303.9, 325.6 and 325.9 nm; only 410.2 and 451.1 nm are
 * visible) and CH (its C–X band at 314 nm beside the 387–390 and 431 nm bands).
 */
const OWN_RANGE = new Set(['In I', 'CH']);
/** Nebular forbidden lines: ≥ 2 lines flagged forbidden each, wherever they lie. */
const FORBIDDEN_REQUIRED = ['O III', 'O II', 'O I', 'N II', 'S II', 'S III', 'Ne III', 'Ar III'];
const MIN_FORBIDDEN = 2;
const MIN_SPECIES = 70;

function countIn(species: string, [from, to]: [number, number]): number {
  const l = catalog.species.get(species);
  if (!l) return 0;
  const [a, b] = windowRange(l.vacuum_nm, from, to);
  return b - a;
}

describe('coverage of issue 4’s species', () => {
  it('prints per species the line count and range, and meets the coverage rule', () => {
    const table = catalog.names.map((name) => {
      const l = catalog.species.get(name);
      if (!l) throw new Error(name);
      const v = l.vacuum_nm;
      return {
        species: name,
        lines: v.length,
        [`in ${VISIBLE_NM[0]}–${VISIBLE_NM[1]} nm`]: countIn(name, VISIBLE_NM),
        forbidden: l.flags.filter((f) => f.includes('forbidden')).length,
        from_nm: Number((v[0] as number).toFixed(1)),
        to_nm: Number((v[v.length - 1] as number).toFixed(1)),
        memory: l.origin.filter((o) => o === 'memory').length,
        required: REQUIRED.includes(name) ? 'yes' : '',
      };
    });
    // The coverage table on request only: a clean test run prints nothing to puzzle over.
    if (process.env.LINELEDGER_CATALOG_TABLE) {
      console.log(`catalog ${catalog.version}: ${catalog.names.length} species`);
      console.table(table);
    }

    const short: string[] = [];
    for (const s of REQUIRED) {
      const own = OWN_RANGE.has(s);
      const n = own ? (catalog.species.get(s)?.vacuum_nm.length ?? 0) : countIn(s, VISIBLE_NM);
      const need = s === 'Fe I' ? MIN_FE_I : MIN_LINES;
      if (n < need) short.push(`${s}: ${n} lines ${own ? 'in all' : 'in 350–1000 nm'}, needs ${need}`);
    }
    for (const s of FORBIDDEN_REQUIRED) {
      const n = catalog.species.get(s)?.flags.filter((f) => f.includes('forbidden')).length ?? 0;
      if (n < MIN_FORBIDDEN) short.push(`[${s}]: ${n} forbidden lines, needs ${MIN_FORBIDDEN}`);
    }
    expect(short).toEqual([]);
  });

  it(`has at least ${MIN_SPECIES} species`, () => {
    expect(catalog.names.length).toBeGreaterThanOrEqual(MIN_SPECIES);
  });
});
