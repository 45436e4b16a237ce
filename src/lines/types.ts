/** The reference line catalog, as loaded: per species, sorted typed arrays. */

/**
 * Where a row's value comes from: `read` from a stored copy of the cited source, `memory`
 * (recalled, not checked against the source), or `computed` from a formula and constants the
 * source key cites (H I and He II from the Rydberg formula).
 */
export type LineOrigin = 'read' | 'memory' | 'computed';

export const LINE_ORIGINS: readonly LineOrigin[] = ['read', 'memory', 'computed'];

export interface SpeciesLines {
  species: string;
  /** Sorted ascending. */
  vacuum_nm: Float64Array;
  /** NaN where air is undefined (below 200 nm). */
  air_nm: Float64Array;
  unc_nm: Float64Array;
  intensity: Float64Array;
  flags: readonly (readonly string[])[];
  source: readonly string[];
  origin: readonly LineOrigin[];
  /** Where each row came from, for diagnostics and the record ("atomic.tsv:42"). */
  row: readonly string[];
}

export interface SourceCitation {
  key: string;
  citation: string;
  intensity: string;
}

export interface CandidateGroup {
  id: string;
  title: string;
  description: string;
  species: readonly string[];
}

export interface Catalog {
  version: string;
  /** SHA-256 over the catalog files' bytes, in file-name order, each prefixed by its name. */
  sha256: string;
  species: ReadonlyMap<string, SpeciesLines>;
  /** Species names, sorted. */
  names: readonly string[];
  sources: ReadonlyMap<string, SourceCitation>;
  groups: ReadonlyMap<string, CandidateGroup>;
  defaultGroupsBySourceKind: ReadonlyMap<string, readonly string[]>;
}

/** A catalog file's name and text, as the read edge hands it over. */
export interface CatalogFile {
  name: string;
  text: string;
}
