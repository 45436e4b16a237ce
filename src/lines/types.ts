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
  /**
   * Line strengths under other conditions than the lab discharge (data/lines/conditions.tsv),
   * aligned with the rows above: NaN where the condition's table gives the row no strength.
   * A condition is present only when its table names at least one line of the species.
   */
  strengths: ReadonlyMap<LineCondition, Float64Array>;
}

/**
 * Conditions a line strength can be given for. `lab` is the catalog's own intensity column
 * (discharge lamps, NIST); the others come from data/lines/conditions.tsv.
 */
export type LineCondition = 'flame' | 'nebular' | 'stellar-absorption';

export const LINE_CONDITIONS: readonly LineCondition[] = ['flame', 'nebular', 'stellar-absorption'];

/** What a session's source reads its line strengths from: the lab column or a condition's table. */
export type IntensityCondition = 'lab' | LineCondition;

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
  /** The lines identification weighs as evidence, by species. */
  species: ReadonlyMap<string, SpeciesLines>;
  /**
   * Rows flagged `faint`, by species: weaker lines kept so that a measured line nothing else
   * explains can be assigned to a species the explanation holds, never weighed as evidence
   * (docs/identification.md, "Faint lines"). Their `strengths` are always empty.
   */
  faint: ReadonlyMap<string, SpeciesLines>;
  /** Species names, sorted. */
  names: readonly string[];
  sources: ReadonlyMap<string, SourceCitation>;
  groups: ReadonlyMap<string, CandidateGroup>;
  defaultGroupsBySourceKind: ReadonlyMap<string, readonly string[]>;
  /** Species priors by source (data/priors.yaml); empty when the data folder has none. */
  priors: SourcePriors;
}

/** A catalog file's name and text, as the read edge hands it over. */
export interface CatalogFile {
  name: string;
  text: string;
}

/** One entry of data/priors.yaml: a species (or a group's members) with its prior and why. */
export interface PriorEntry {
  p: number;
  reason: string;
  source: string;
  /** The species it applies to: one, or a group's members. */
  members: readonly string[];
  /** The group's id when the entry names a group (a named species overrides it). */
  group: string | null;
}

export interface SourcePriorSet {
  lines_listed: 'all-seen' | 'selection' | null;
  lab_intensities: 'trust' | 'distrust' | null;
  /** Whose line strengths this source shows (lab, or a condition of conditions.tsv). */
  intensities: IntensityCondition | null;
  /**
   * How far, in km/s, this source's line centres scatter about their rest wavelengths times the
   * source's redshift (the broad lines of quasars shift against each other), with its reason.
   */
  line_scatter: { km_s: number; reason: string; source: string } | null;
  /**
   * The prior of each species this set does not name, where the source's make-up is known
   * (a fluorescent lamp holds mercury, its fill gas and its phosphors, hardly anything else);
   * null: the model's uninformed prior.
   */
  others: { p: number; reason: string; source: string } | null;
  priors: PriorEntry[];
}

/** Priors by source.kind and by source.class (a class inherits and overrides its kind). */
export interface SourcePriors {
  kinds: ReadonlyMap<string, SourcePriorSet>;
  classes: ReadonlyMap<string, SourcePriorSet>;
}
