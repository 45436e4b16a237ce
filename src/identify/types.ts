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
  /** Indices of the refs within reach of some measured line (the only ones matching can use). */
  touched: number[];
  /** Detection probability of each ref under the profiled detection limit. */
  q: Float64Array;
  /** Σ log(1 − q): the completeness cost paid if nothing matched. */
  missCost: number;
  threshold: number;
  /** Whether this species' intensities were distrusted (flat detection, no rank term). */
  flat: boolean;
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
  /** The species in spectroscopic notation for this line ([O III], C III]). */
  display: string;
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

/**
 * identified: its species is confirmed; tentative: the best plausible assignment, its species
 * not confirmed (or the explanation in doubt); unexplained: no assignment beats chance.
 */
export type LineStatus = 'identified' | 'tentative' | 'unexplained';

export interface AssignedLine {
  /** Index of the line in the session file. */
  index: number;
  status: LineStatus;
  /** Probability that the assignment is right (0 when unexplained). */
  probability: number;
  /** Set for identified and tentative lines. */
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
  /** Calibrated probability that exactly this set is right (see model.ts). */
  confidence: number;
  /** Its posterior share among the explanations weighed, before calibration. */
  raw_confidence: number;
  /** Joint log-likelihood ratio of the set, less the per-species penalties (nats). */
  score: number;
  status: IdentificationStatus;
  /** Species of the explanation that come from Earth's atmosphere (telluric bands). */
  telluric: string[];
  /** Species with only tentative lines, or in the explanation but not confirmed. */
  tentative: string[];
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
  /** The shift found by a search, when the session asked for one (else null). */
  shift: ShiftFound | null;
  /** Each considered species in spectroscopic notation ([O III], C III]) for this session. */
  display: Record<string, string>;
  /** The fitted reading offset/scale when one was found and applied (else null). */
  scale: ScaleCorrection | null;
  /** What the list was taken to be, and from where. */
  lines_listed: { value: 'all-seen' | 'selection'; stated: boolean };
}

/** A systematic reading error fitted as nuisance parameters: λ_true = λ_read − offset − scale·(λ_read − pivot). */
export interface ScaleCorrection {
  offset_nm: number;
  offset_sigma_nm: number;
  /** Linear scale error (dimensionless, per nm of distance from the pivot); 0 when not fitted. */
  scale: number;
  scale_sigma: number;
  pivot_nm: number;
  /** Species whose lines fixed it. */
  against: string[];
  lines_used: number;
  /** How much better the explanation scores with it (nats). */
  gain_nats: number;
  message: string;
}

export interface ScanPoint {
  z: number;
  velocity_km_s: number;
  score: number;
}

export interface ShiftFound {
  mode: 'redshift' | 'velocity';
  z: number;
  z_sigma: number;
  velocity_km_s: number;
  velocity_sigma_km_s: number;
  /** Lines whose matches fixed the shift. */
  lines_used: number;
  score: number;
  step_z: number;
  scan: ScanPoint[];
  runner_up: { z: number; velocity_km_s: number; score: number } | null;
  warning: string | null;
  /** Barycentric values when the session gave a barycentric correction. */
  barycentric_velocity_km_s: number | null;
  barycentric_z: number | null;
}
