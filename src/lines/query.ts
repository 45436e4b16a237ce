/**
 * "What lies near this wavelength?" — a pure query over the loaded catalog. The command
 * (src/commands/lookup.ts) only parses arguments and prints; everything it shows comes from here.
 */
import type { Diagnostic, Outcome } from '../diagnostics.js';
import { airToVacuum } from '../reduce/airVacuum.js';
import { didYouMean } from '../session/suggest.js';
import { lowerBound, windowRange } from './search.js';
import type { Catalog, LineOrigin, SpeciesLines } from './types.js';

export type QueryMedium = 'air' | 'vacuum';

export interface LineQuery {
  /** The wavelength asked about, in `medium`. */
  wavelength_nm: number;
  /** Half-width of the window, in nm (the window is wavelength ± window_nm). */
  window_nm: number;
  medium: QueryMedium;
  /** Species to look in; null means every species of the catalog. */
  species: readonly string[] | null;
  /** Also list faint lines (flag `faint`: weak lines never weighed as evidence). */
  faint?: boolean;
}

export interface LineHit {
  species: string;
  /** The species as written for people: forbidden lines in brackets, `[O III]`, semiforbidden `C III]`. */
  label: string;
  vacuum_nm: number;
  /** null below 200 nm, where air wavelengths are not defined. */
  air_nm: number | null;
  /** The line in the query's medium (vacuum where air is undefined). */
  wavelength_nm: number;
  /** Line minus query, in the query's medium. */
  distance_nm: number;
  unc_nm: number;
  intensity: number;
  /** 1 = the species' strongest line; equal intensities share a rank. */
  intensity_rank: number;
  /** How many lines the species has, so the rank can be read ("3 of 47"). */
  species_lines: number;
  flags: readonly string[];
  source: string;
  origin: LineOrigin;
  /** Where the row is ("atomic.tsv:42"). */
  row: string;
}

export interface LineQueryResult {
  hits: LineHit[];
  /** The closest line outside the window when nothing is inside, so an empty answer still helps. */
  nearest: LineHit | null;
}

/** Case, spacing and brackets ("[o iii]") do not matter when naming a species. */
function normaliseSpecies(name: string): string {
  return name
    .replace(/^\[(.*)\]$/, '$1')
    .replace(/\]$/, '')
    .trim()
    .replace(/\s+/g, ' ')
    .toLowerCase();
}

function problem(field: string, message: string, hint?: string): Diagnostic {
  return {
    file: '<command line>',
    line: 1,
    col: 1,
    severity: 'error',
    code: 'unknown-name',
    field,
    message,
    ...(hint ? { hint } : {}),
  };
}

/**
 * The species a query may look in: the named species and the species of the named groups
 * (a union, as in a session's `candidates`), or null (everything) when neither is given.
 */
export function resolveSpeciesFilter(
  catalog: Catalog,
  species: readonly string[],
  groups: readonly string[],
): Outcome<string[] | null> {
  if (species.length === 0 && groups.length === 0) return { ok: true, value: null, warnings: [] };
  const diagnostics: Diagnostic[] = [];
  const chosen = new Set<string>();
  const byKey = new Map(catalog.names.map((n) => [normaliseSpecies(n), n]));
  for (const name of species) {
    const found = byKey.get(normaliseSpecies(name));
    if (found) {
      chosen.add(found);
      continue;
    }
    const guess = didYouMean(name, catalog.names);
    diagnostics.push(
      problem(
        '--species',
        `the catalog has no species "${name}"`,
        guess ? `did you mean "${guess}"?` : 'write it as element and ion stage, e.g. "Fe II"',
      ),
    );
  }
  const groupIds = [...catalog.groups.keys()];
  for (const id of groups) {
    const group = catalog.groups.get(id);
    if (group) {
      for (const s of group.species) chosen.add(s);
      continue;
    }
    const guess = didYouMean(id, groupIds);
    diagnostics.push(
      problem(
        '--group',
        `there is no candidate group "${id}"`,
        guess ? `did you mean "${guess}"?` : `known groups: ${groupIds.join(', ')}`,
      ),
    );
  }
  if (diagnostics.length > 0) return { ok: false, diagnostics };
  return { ok: true, value: [...chosen].sort(), warnings: [] };
}

/** The bracket convention of the pages (src/report/format.ts speciesLabel); a data stage may not import report/. */
function labelFor(species: string, flags: readonly string[]): string {
  if (flags.includes('forbidden')) return `[${species}]`;
  if (flags.includes('semiforbidden')) return `${species}]`;
  return species;
}

/** `both`: the species' weighed and faint lines, which rank together (one table's scale). */
function hitAt(lines: SpeciesLines, k: number, query: LineQuery, both: readonly SpeciesLines[]): LineHit {
  const vacuum_nm = lines.vacuum_nm[k] as number;
  const air = lines.air_nm[k] as number;
  const air_nm = Number.isNaN(air) ? null : air;
  const wavelength_nm = query.medium === 'air' && air_nm !== null ? air_nm : vacuum_nm;
  const intensity = lines.intensity[k] as number;
  let stronger = 0;
  for (const table of both) for (const other of table.intensity) if (other > intensity) stronger++;
  const flags = lines.flags[k] ?? [];
  return {
    species: lines.species,
    label: labelFor(lines.species, flags),
    vacuum_nm,
    air_nm,
    wavelength_nm,
    distance_nm: wavelength_nm - query.wavelength_nm,
    unc_nm: lines.unc_nm[k] as number,
    intensity,
    intensity_rank: stronger + 1,
    species_lines: both.reduce((n, t) => n + t.vacuum_nm.length, 0),
    flags,
    source: lines.source[k] as string,
    origin: lines.origin[k] as LineOrigin,
    row: lines.row[k] as string,
  };
}

const byDistance = (a: LineHit, b: LineHit) =>
  Math.abs(a.distance_nm) - Math.abs(b.distance_nm) ||
  a.species.localeCompare(b.species) ||
  a.vacuum_nm - b.vacuum_nm;

/** Vacuum wavelength of a query-medium wavelength (the catalog is indexed in vacuum). */
function toVacuum(wavelength_nm: number, medium: QueryMedium): number {
  return medium === 'air' ? airToVacuum(wavelength_nm) : wavelength_nm;
}

/**
 * Catalog lines within ±window of the wavelength, nearest first. Each species' window is found
 * by binary search on its sorted vacuum wavelengths (the air↔vacuum conversion is monotonic, so
 * the window's ends convert exactly); distances are then measured in the query's own medium.
 */
/**
 * How far a row's own air value may sit from its vacuum value converted by the IAU formula (the
 * catalog checks allow 0.002 nm; sources round and use other formulas). The search in vacuum is
 * widened by this, and the window is then applied in the query's medium, so a line whose air
 * value is inside the window is never lost because its vacuum value lies just outside.
 */
const MEDIUM_MARGIN_NM = 0.01;

export function queryLines(catalog: Catalog, query: LineQuery): LineQueryResult {
  // Widened in vacuum too: the window's edges are then decided by the exact test below alone.
  const from_vac = toVacuum(query.wavelength_nm - query.window_nm, query.medium) - MEDIUM_MARGIN_NM;
  const to_vac = toVacuum(query.wavelength_nm + query.window_nm, query.medium) + MEDIUM_MARGIN_NM;
  const centre_vac = toVacuum(query.wavelength_nm, query.medium);
  const hits: LineHit[] = [];
  let nearest: LineHit | null = null;
  for (const name of query.species ?? catalog.names) {
    // Faint lines rank with the species' other lines; they are listed only when asked for.
    const both = [catalog.species.get(name), catalog.faint.get(name)].filter(
      (t): t is SpeciesLines => t !== undefined,
    );
    const weighed = catalog.species.get(name);
    for (const lines of query.faint ? both : both.filter((t) => t === weighed)) {
      const [start, end] = windowRange(lines.vacuum_nm, from_vac, to_vac);
      for (let k = start; k < end; k++) {
        const hit = hitAt(lines, k, query, both);
        // The medium conversion at the window's ends can differ from the line's own air value
        // in the last digit; the window is defined in the query's medium, so check it there.
        if (Math.abs(hit.distance_nm) <= query.window_nm + 1e-9) hits.push(hit);
      }
      const at = lowerBound(lines.vacuum_nm, centre_vac);
      for (const k of [at - 1, at]) {
        if (k < 0 || k >= lines.vacuum_nm.length) continue;
        const hit = hitAt(lines, k, query, both);
        if (nearest === null || byDistance(hit, nearest) < 0) nearest = hit;
      }
    }
  }
  hits.sort(byDistance);
  return { hits, nearest: hits.length > 0 ? null : nearest };
}
