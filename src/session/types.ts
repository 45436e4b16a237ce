/** The typed, normalised session that every later stage receives. */
import type { SourcePosition } from '../diagnostics.js';
import type { ProfileData } from './profile/types.js';
import type {
  LINE_KINDS,
  LINES_LISTED,
  METHODS,
  SOURCE_KINDS,
  SourceClass,
  WAVELENGTH_UNITS,
} from './vocabulary.js';

export type { SourceClass } from './vocabulary.js';

export type SourceKind = (typeof SOURCE_KINDS)[number];
export type LinesListed = (typeof LINES_LISTED)[number];
export type MeasurementMethod = (typeof METHODS)[number];
export type WavelengthUnit = (typeof WAVELENGTH_UNITS)[number];
export type LineKind = (typeof LINE_KINDS)[number];
export type Medium = 'air' | 'vacuum';

export type ShiftRequest =
  | { mode: 'none' }
  | { mode: 'velocity'; velocity_km_s: number; sigma_km_s: number }
  | { mode: 'redshift'; z: number; sigma: number }
  | { mode: 'velocity-search'; from_km_s: number; to_km_s: number }
  | { mode: 'redshift-search'; from: number; to: number };

export interface BarycentricRequest {
  ra_deg: number;
  dec_deg: number;
}

export interface GratingSpec {
  spacing_nm: number;
  spacing_sigma_nm: number;
  type: 'transmission' | 'reflection';
}

export interface CalibrationPoint {
  pixel: number;
  pixel_sigma: number;
  /** In the session's measurement unit and medium, as written. */
  wavelength: number;
  label: string | null;
  position: SourcePosition;
}

export interface MeasurementSpec {
  method: MeasurementMethod;
  unit: WavelengthUnit;
  /** Default reading uncertainty in the reading's own unit (nm/Å/µm, degrees, mm or px); null if not given. */
  sigma: number | null;
  grating: GratingSpec | null;
  order: number;
  incidence_deg: number;
  screen_distance_mm: number | null;
  screen_distance_sigma_mm: number;
  calibration: {
    points: CalibrationPoint[];
    degree: number;
    zero_order_pixel: number | null;
    dispersion_nm_per_px: number | null;
    pixel_size_um: number | null;
    sensor_distance_mm: number | null;
  } | null;
}

/** A raw reading, not yet reduced: exactly one of the position fields is set, per method. */
export interface RawLine {
  index: number;
  position: SourcePosition;
  wavelength: number | null;
  angle_deg: number | null;
  angle_left_deg: number | null;
  angle_right_deg: number | null;
  offset_mm: number | null;
  separation_mm: number | null;
  pixel: number | null;
  /** Reading uncertainty in the reading's unit; null means "use the session default". */
  sigma: number | null;
  order: number | null;
  same_as: number | null;
  /** Relative intensity on a 0–∞ scale (words mapped to 1…5); null when not given. */
  intensity: number | null;
  kind: LineKind;
  width_nm: number | null;
  label: string | null;
}

/** A profile named by the session, read and checked, with what the observer decided. */
export interface SessionProfile {
  /** The file name as the session writes it (relative to the session). */
  file: string;
  data: ProfileData;
  kind: LineKind;
  /** Hex SHA-256 of the profile file's bytes, for provenance. */
  sha256: string;
  /** Detection threshold in units of the estimated noise. */
  threshold_sigma: number;
  /** Positions in the axis unit of the session (px, or measurement.unit). */
  add: number[];
  drop: number[];
  /** Found lines the observer labelled or gave another σ (same axis unit). */
  edit: ProfileEdit[];
  position: SourcePosition;
}

export interface ProfileEdit {
  at: number;
  label: string | null;
  sigma: number | null;
  /** Where the edit stands in the session file, for its warnings. */
  position: SourcePosition;
}

export interface InstrumentSpec {
  description: string | null;
  resolution_nm: number | null;
  resolving_power: number | null;
  range_nm: [number, number] | null;
}

export interface Session {
  id: string;
  file: string;
  title: string;
  date: string | null;
  observer: string | null;
  site: { name: string | null; lat: number | null; lon: number | null; elevation_m: number | null } | null;
  /** `class` is the observer's finer class of source, if named (it fits `kind`, checked on reading). */
  source: { kind: SourceKind; class: SourceClass | null; name: string | null };
  /** What the observer said of the list: every line seen, a selection, or nothing (null). */
  lines_listed: LinesListed | null;
  instrument: InstrumentSpec;
  medium: Medium;
  candidates: { groups: string[]; species: string[]; exclude: string[] };
  shift: ShiftRequest;
  barycentric: BarycentricRequest | null;
  measurement: MeasurementSpec;
  /** Typed lines; with a profile these are empty until the reduce stage finds them. */
  lines: RawLine[];
  /** A recorded spectrum whose lines are to be found (null when lines are typed). */
  profile: SessionProfile | null;
  notes: string;
  /** Hex SHA-256 of the file's bytes, for provenance. */
  input_sha256: string;
  /**
   * Where each field outside `lines` sits in the file (keys like `measurement.grating.lines_per_mm`,
   * `candidates.species[1]`), so later stages can point their diagnostics at it.
   */
  field_positions: Record<string, SourcePosition>;
}
