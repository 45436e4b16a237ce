/**
 * Templates for a new session file, one per measurement method. Pure: the date, the id
 * and the schema reference come in as parameters (the command supplies the date).
 *
 * Every value the user must supply is left empty (`~`, YAML's null) with a comment that
 * says what goes there, so an unfilled template does not read: `lineledger vet` points at
 * each empty value in turn. Example values would read fine and could end up published as
 * if they were measurements; empty ones cannot.
 */
import { isAbsolute, relative, sep } from 'node:path';
import { impossibleDate } from './plausible.js';
import type { MeasurementMethod } from './types.js';

/** What `lineledger new --method` offers: each measurement method, and a recorded profile. */
export const TEMPLATE_KINDS = ['wavelength', 'grating-angle', 'screen', 'pixel', 'profile'] as const;
export type TemplateKind = MeasurementMethod | 'profile';

export interface ScaffoldInput {
  method: TemplateKind;
  /** ISO date (YYYY-MM-DD) written as the session date: the file name's, else the day it is created. */
  date: string;
  id: string;
  /** What the `$schema=` comment points at: a relative path or an absolute one. */
  schemaRef: string;
}

/**
 * The schema reference for a new file: the path from the file's folder to the schema, so that
 * it stays right when the archive is moved or cloned (an absolute path names one machine).
 * `inside` says whether the schema lies inside the file's project: if not, the path leads to
 * this installation of lineledger, which others who clone the archive will not have. Both
 * folders and the schema path must be absolute.
 */
export function schemaReference(
  newFileDir: string,
  projectRoot: string,
  schemaFile: string,
): { ref: string; inside: boolean } {
  const within = relative(projectRoot, schemaFile);
  const inside = !within.startsWith('..') && !isAbsolute(within);
  // On Windows a schema on another drive has no relative path: then only the absolute one works.
  const rel = relative(newFileDir, schemaFile);
  return { ref: (isAbsolute(rel) ? schemaFile : rel).split(sep).join('/'), inside };
}

/**
 * The date a file name starts with (`2026-06-01-tube.yaml` → 2026-06-01), when it is a real
 * calendar date; null otherwise.
 */
export function dateFromFileName(fileName: string): string | null {
  const base = fileName.replace(/^.*[\\/]/, '');
  const m = /^(\d{4}-\d{2}-\d{2})(?![\d])/.exec(base);
  if (!m?.[1]) return null;
  return impossibleDate(m[1]) === null ? m[1] : null;
}

const MEASUREMENT: Record<MeasurementMethod, string> = {
  wavelength: `measurement:
  method: wavelength
  unit: nm                    # the unit of your scale: nm, angstrom or um
  sigma: ~                    # FILL IN: uncertainty of one reading, in that unit (e.g. half a scale division)
`,
  'grating-angle': `measurement:
  method: grating-angle
  grating: { lines_per_mm: ~ }  # FILL IN: groove density printed on the grating (or spacing_um: instead)
  order: 1                    # the diffraction order you read
  sigma: ~                    # FILL IN: uncertainty of one angle setting, in degrees (1 arcminute = 0.017)
`,
  screen: `measurement:
  method: screen
  grating: { lines_per_mm: ~ }  # FILL IN: groove density printed on the grating (or spacing_um: instead)
  order: 1                    # the diffraction order you measured
  screen_distance_mm: ~       # FILL IN: distance from the grating to the screen, in mm
  # screen_distance_sigma_mm: 2   # how well you know that distance
  sigma: ~                    # FILL IN: uncertainty of one position on the screen, in mm
`,
  pixel: `measurement:
  method: pixel
  unit: nm                    # the unit of the calibration wavelengths below
  sigma: ~                    # FILL IN: uncertainty of one pixel position, in pixels (e.g. 0.5)
  calibration:
    degree: 1                 # 1 (straight line) to 3; needs more calibration lines than the degree
    lines:                    # lines of a known lamp in the same set-up; add as many as you can
      - { pixel: ~, wavelength: ~ }   # FILL IN: pixel column and known wavelength (in the unit above)
      - { pixel: ~, wavelength: ~ }   # FILL IN
      - { pixel: ~, wavelength: ~ }   # FILL IN
`,
};

const LINE: Record<MeasurementMethod, { entry: string; what: string }> = {
  wavelength: { entry: 'wavelength: ~', what: 'the reading, in measurement.unit' },
  'grating-angle': {
    entry: 'angle_left_deg: ~, angle_right_deg: ~',
    what: `table readings on both sides (e.g. "135° 43'"), or angle_deg: from straight through`,
  },
  screen: {
    entry: 'offset_mm: ~',
    what: 'distance from the central maximum in mm, or separation_mm: between the ±m maxima',
  },
  pixel: { entry: 'pixel: ~', what: 'pixel column of the line' },
};

/** A camera profile: pixel calibration as for method pixel, and the profile instead of lines. */
const PROFILE = `profile:
  file: ~                     # FILL IN: the profile beside this file: CSV/TSV (pixel, intensity[, uncertainty]) or 1-D FITS
  # kind: emission            # emission peaks or absorption dips (absorption is the default for stars)
  # threshold: 5              # how many times the noise a line must stand out
  # add: [812.5]              # pixel positions of lines the finder missed (fitted there)
  # drop: [1033]              # pixel positions of found lines to leave out (a cosmic-ray spike)
  # edit: [{ at: 640.2, label: "yellow", sigma: 0.3 }]   # label a found line, or give it another σ
# For a profile saved in wavelengths (or a FITS spectrum with CTYPE1 WAVE/AWAV), use
# measurement: { method: wavelength, unit: nm } instead, without calibration.
`;

export function sessionTemplate(input: ScaffoldInput): string {
  const method: MeasurementMethod = input.method === 'profile' ? 'pixel' : input.method;
  const line = LINE[method];
  const entries = [0, 1, 2]
    .map((i) => `  - { ${line.entry}, intensity: medium }${i === 0 ? `   # FILL IN: ${line.what}` : ''}`)
    .join('\n');
  const measurement =
    input.method === 'profile' ? MEASUREMENT.pixel.replace(/ {2}sigma: ~ .*\n/, '') : MEASUREMENT[method];
  const body =
    input.method === 'profile'
      ? PROFILE
      : `lines:                        # one entry per line seen; add or delete entries\n${entries}\n`;
  return `# yaml-language-server: $schema=${input.schemaRef}
# A new lineledger session (method: ${input.method}).
# Replace every ~ marked FILL IN with your value; \`lineledger vet\` lists the ones still empty.
# Lines that start with # are optional extras: delete the # to use one.
lineledger: 1
id: ${input.id}${' '.repeat(Math.max(1, 26 - input.id.length))}# lower-case letters, digits and dashes; also the page's folder name
title: ~                      # FILL IN: what was measured, e.g. "Unlabelled tube C"
date: ${input.date}              # the day of the measurement; or a UTC date-time such as ${input.date}T21:30:00Z
observer: ~                   # FILL IN: who took the readings
# site: { name: School lab, lat: 51.5, lon: -0.1, elevation_m: 20 }
source:
  kind: ~                     # FILL IN: lamp, flame, star, nebula, galaxy, sky, laser, other or unknown
  # name: tube C
instrument:
  description: ~              # FILL IN: the set-up, e.g. "student spectrometer, 600 lines/mm grating"
  # resolution_nm: 1.0        # smallest separation of two lines you could still tell apart
  # range_nm: [400, 700]      # the wavelengths the set-up could see
medium: air                   # air or vacuum: what the wavelengths refer to (air for bench work)
# candidates: { groups: [discharge-gases] }   # narrow the species considered
${measurement}${body}# notes: |
#   How the run went, in Markdown.
`;
}
