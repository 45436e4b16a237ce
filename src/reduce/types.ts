/** What the reduce stage hands to identification and to the record. */
import type { Diagnostic, SourcePosition } from '../diagnostics.js';
import type { LineKind, Medium, Session } from '../session/types.js';
import type { ProfileFinding } from './profile/find.js';

/** One reading turned into a wavelength in the session's medium, before air→vacuum and shift. */
export interface ObservedReading {
  /** Index of the line in the session file. */
  index: number;
  /** Wavelength in the session's medium (air or vacuum), nm, observed frame. */
  wavelength_nm: number;
  sigma_nm: number;
  /** The raw reading as a person would write it, for the reduction table ("θ = 9° 26′, m = 1"). */
  reading_text: string;
}

export interface CalibrationPointResult {
  pixel: number;
  wavelength_nm: number;
  fitted_nm: number;
  residual_nm: number;
  /** |residual| > 3 × RMS of the others (flagged, never dropped). */
  outlier: boolean;
  label: string | null;
}

export interface CalibrationResult {
  kind: 'polynomial' | 'slitless';
  /** Coefficients c₀…c_k of λ(p) = Σ cᵢ (p − p₀)ⁱ in nm, with p₀ = `pixel_origin`. */
  coefficients: number[];
  pixel_origin: number;
  /** Covariance matrix of the coefficients, nm². */
  covariance: number[][];
  degree: number;
  rms_nm: number;
  points: CalibrationPointResult[];
  pixel_range: [number, number];
  /** Words for the record: how the fit was made. */
  description: string;
}

export interface MethodDescription {
  /** "Grating equation, m·λ = d·(sin α + sin β)" and so on. */
  formula: string;
  /** One paragraph in words. */
  text: string;
}

export interface MethodResult {
  readings: ObservedReading[];
  calibration: CalibrationResult | null;
  description: MethodDescription;
  diagnostics: Diagnostic[];
}

export interface AppliedShift {
  source: 'velocity' | 'redshift' | 'search';
  z: number;
  z_sigma: number;
  velocity_km_s: number;
  velocity_sigma_km_s: number;
  barycentric: BarycentricCorrection | null;
}

export interface BarycentricCorrection {
  /** Velocity to add to the measured radial velocity to refer it to the solar-system barycentre. */
  correction_km_s: number;
  ra_deg: number;
  dec_deg: number;
  date_utc: string;
  lat_deg: number;
  lon_deg: number;
  elevation_m: number;
  method: string;
}

export interface MeasuredLine {
  index: number;
  /** Other readings of the same line that were combined into this one. */
  combined_indices: number[];
  /** Spread (max − min) of the combined readings, nm; 0 for a single reading. */
  combined_spread_nm: number;
  position: SourcePosition;
  /** Observed frame. */
  vacuum_nm: number;
  air_nm: number;
  sigma_nm: number;
  /** Rest frame (shift removed), vacuum: what identification uses. */
  rest_vacuum_nm: number;
  rest_sigma_nm: number;
  intensity: number | null;
  kind: LineKind;
  width_nm: number | null;
  label: string | null;
  reading_text: string;
}

export interface Reduction {
  session: Session;
  medium: Medium;
  lines: MeasuredLine[];
  calibration: CalibrationResult | null;
  /** The lines found in the session's profile, its continuum and threshold (null: lines were typed). */
  profile: ProfileFinding | null;
  /** A known shift that was removed; a searched shift is found later, by identification. */
  shift: AppliedShift | null;
  description: MethodDescription;
  /** Instrument resolution (FWHM) in nm at the centre of the lines, if known. */
  resolution_nm: number | null;
  warnings: Diagnostic[];
}
