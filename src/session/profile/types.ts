/** A recorded spectrum (profile) as the read stage hands it on: plain arrays, one unit per axis. */
import type { Medium } from '../types.js';

export type ProfileAxis = 'pixel' | 'wavelength';
export type ProfileFormat = 'csv' | 'fits';

export interface ProfileData {
  format: ProfileFormat;
  axis: ProfileAxis;
  /** Pixel positions (px), or wavelengths in nm, strictly increasing after reading. */
  x: number[];
  intensity: number[];
  /** One uncertainty per point (same unit as intensity), when the file gives them. */
  sigma: number[] | null;
  /** What the file says the wavelengths refer to (FITS CTYPE1); null when it does not say. */
  medium: Medium | null;
  /** A few words for the record: what was read and how the axis was made. */
  description: string;
}

/** A problem with a profile file, before it is placed at the session's `profile.file` field. */
export interface ProfileProblem {
  code: string;
  message: string;
  hint: string;
}

export type ProfileParse = { ok: true; profile: ProfileData } | { ok: false; problems: ProfileProblem[] };

/** What the edge hands the read stage: the file's bytes, or why it could not be read. */
export type ProfileInput = { name: string; bytes: Uint8Array } | { name: string; problem: ProfileProblem };
