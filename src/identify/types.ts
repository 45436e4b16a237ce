/** What identification produces: per-species evidence, the explanation, line assignments. */

export interface RefLine {
  species: string;
  /** Rest vacuum wavelength; for a merged blend, the intensity-weighted centre. */
  vacuum_nm: number;
  unc_nm: number;
  intensity: number;
  flags: readonly string[];
  /** How many catalog lines were merged into this one (1 = not a blend). */
  members: number;
}

export interface PreparedSpecies {
  species: string;
  refs: RefLine[];
  /** Detection probability of each ref under the profiled detection limit. */
  q: Float64Array;
  /** Σ log(1 − q): the completeness cost paid if nothing matched. */
  missCost: number;
  threshold: number;
}

export interface Match {
  /** Index into the measured-lines array (sorted by wavelength). */
  line: number;
  ref: RefLine;
  residual_nm: number;
  gain: number;
}

export interface SpeciesEvidence {
  species: string;
  /** Log-likelihood ratio against "all lines are background", nats. */
  score: number;
  matched: number;
  /** Reference lines in range above the profiled detection limit. */
  expected: number;
  /** Strong lines (above the limit) in range that no measured line matched, vacuum nm. */
  missing_nm: number[];
  false_alarm: number;
  /** Spearman correlation of measured vs. reference intensity over the matches, if computable. */
  rank_correlation: number | null;
  rms_residual_nm: number | null;
  matches: Match[];
  /** Posterior probability that this species is part of the true explanation. */
  confidence: number;
  telluric: boolean;
}

export interface LineAssignment {
  species: string;
  ref_vacuum_nm: number;
  residual_nm: number;
  residual_km_s: number;
  blend: boolean;
  flags: readonly string[];
}

export interface Alternative {
  species: string;
  ref_vacuum_nm: number;
  residual_nm: number;
}

export interface AssignedLine {
  /** Index of the line in the session file. */
  index: number;
  assignment: LineAssignment | null;
  alternatives: Alternative[];
}

export type IdentificationStatus = 'identified' | 'ambiguous' | 'unexplained';

export interface ContendingExplanation {
  species: string[];
  probability: number;
  score: number;
}

export interface Explanation {
  species: string[];
  /** Probability that exactly this set is right, among the explanations weighed. */
  confidence: number;
  status: IdentificationStatus;
  /** Session line indices that no species explains. */
  unexplained: number[];
  contenders: ContendingExplanation[];
  /** Lines whose measurement would settle an ambiguity: "measure 667.8 nm to decide". */
  discriminators: { species: string; vacuum_nm: number; air_nm: number; against: string }[];
  summary: string;
}

export interface Identification {
  candidates: SpeciesEvidence[];
  explanation: Explanation;
  lines: AssignedLine[];
  /** Species that were considered. */
  considered: string[];
  /** Range in rest vacuum nm within which lines were expected. */
  range_nm: [number, number];
  fwhm_nm: number;
}
