/**
 * What a schema cannot say about a session: readings no instrument gives (non-finite numbers,
 * wavelengths outside the optical bounds), calendar dates that do not exist, keys that
 * contradict each other, and text holding control characters (terminal escapes, NULs). Pure:
 * the document and positions in, problems out.
 */
import { NM_PER_ANGSTROM, NM_PER_MICROMETRE, SPEED_OF_LIGHT_KM_S } from '../constants.js';
import { READING_BOUNDS } from './limits.js';
import type { LineDocument, SessionDocument } from './schema.js';
import type { FieldPath } from './yamlSource.js';

type Problem = (path: FieldPath, code: string, message: string, hint?: string, key?: boolean) => void;

const NM_PER: Record<string, number> = { nm: 1, angstrom: NM_PER_ANGSTROM, um: NM_PER_MICROMETRE };

/** C0 (but tab, line feed, carriage return), DEL, C1 and the bidirectional overrides. */
// biome-ignore lint/suspicious/noControlCharactersInRegex: finding them is the point.
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;

function walk(value: unknown, path: FieldPath, visit: (v: unknown, p: FieldPath) => void): void {
  visit(value, path);
  if (Array.isArray(value))
    value.forEach((v, i) => {
      walk(v, [...path, i], visit);
    });
  else if (value !== null && typeof value === 'object')
    for (const [k, v] of Object.entries(value)) walk(v, [...path, k], visit);
}

/** Every number finite, every text free of control characters. */
export function checkValues(doc: SessionDocument, problem: Problem): void {
  walk(doc, [], (v, p) => {
    if (typeof v === 'number' && !Number.isFinite(v))
      problem(
        p,
        'invalid-value',
        `${v} is not a finite number`,
        'write the value as read, as a plain number',
      );
    if (typeof v === 'string') {
      const m = CONTROL.exec(v);
      if (m)
        problem(
          p,
          'control-character',
          `the text holds the control character U+${m[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')} (character ${m.index + 1})`,
          'remove it: control characters can be terminal escape sequences and have no place in a record',
        );
    }
  });
}

const DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Why an ISO date (already of the schema's shape) names no real moment, or null. */
export function impossibleDate(text: string): string | null {
  const m =
    /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2}))?(?:\.\d+)?(Z|[+-](\d{2}):?(\d{2}))?)?$/.exec(
      text,
    );
  if (!m) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (mo < 1 || mo > 12) return `there is no month ${m[2]}`;
  // Gregorian leap years: every fourth, but not centuries unless divisible by 400.
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  const days = mo === 2 && leap ? 29 : (DAYS[mo - 1] as number);
  if (d < 1 || d > days) return `${y}-${m[2]} has ${days} days, not ${d}`;
  if (m[4] !== undefined && (Number(m[4]) > 23 || Number(m[5]) > 59 || Number(m[6] ?? 0) > 59))
    return `${m[4]}:${m[5]}${m[6] ? `:${m[6]}` : ''} is not a time of day`;
  if (m[8] !== undefined && (Number(m[8]) > 14 || Number(m[9]) > 59)) return `${m[7]} is not a UTC offset`;
  return null;
}

/** Keys of one line that say the same thing twice, so one would be dropped silently. */
export function checkLineKeys(line: LineDocument, at: FieldPath, problem: Problem): void {
  if (
    line.angle_deg !== undefined &&
    (line.angle_left_deg !== undefined || line.angle_right_deg !== undefined)
  )
    problem(
      [...at, 'angle_deg'],
      'conflicting-keys',
      'give angle_deg, or angle_left_deg with angle_right_deg, not both',
      'keep the readings you took and delete the others',
      true,
    );
  if (line.offset_mm !== undefined && line.separation_mm !== undefined)
    problem(
      [...at, 'offset_mm'],
      'conflicting-keys',
      'give offset_mm or separation_mm, not both',
      'keep the reading you took and delete the other',
      true,
    );
}

/** Wavelengths (lines and calibration lines) inside the bounds a grating can read. */
export function checkWavelengths(doc: SessionDocument, problem: Problem): void {
  const unit = doc.measurement?.unit ?? 'nm';
  const scale = NM_PER[unit] ?? 1;
  const { minWavelength_nm: lo, maxWavelength_nm: hi } = READING_BOUNDS;
  const check = (value: number | undefined, path: FieldPath) => {
    if (value === undefined || !Number.isFinite(value) || !(value > 0)) return;
    const nm = value * scale;
    if (!(nm >= lo && nm <= hi))
      problem(
        path,
        'impossible-value',
        `${value} ${unit} is ${nm < lo ? 'below' : 'above'} what a grating reads (${lo} nm to ${hi} nm)`,
        `check the number and measurement.unit (${unit})`,
      );
  };
  for (const [i, l] of (doc.lines ?? []).entries()) check(l.wavelength, ['lines', i, 'wavelength']);
  for (const [i, l] of (doc.measurement?.calibration?.lines ?? []).entries())
    check(l.wavelength, ['measurement', 'calibration', 'lines', i, 'wavelength']);
}

/** A known shift a source can have: |v| below the speed of light, z above -1 and not absurd. */
export function checkShift(doc: SessionDocument, problem: Problem): void {
  const s = doc.shift;
  if (!s) return;
  const v = s.velocity_km_s;
  const vs = typeof v === 'number' ? [v] : (v?.search ?? []);
  for (const x of vs)
    if (Number.isFinite(x) && Math.abs(x) >= SPEED_OF_LIGHT_KM_S)
      problem(
        ['shift', 'velocity_km_s'],
        'impossible-value',
        `a velocity of ${x} km/s is not below the speed of light (${SPEED_OF_LIGHT_KM_S} km/s)`,
        'for a large shift give redshift: instead',
      );
  const z = s.redshift;
  const zs = typeof z === 'number' ? [z] : (z?.search ?? []);
  for (const x of zs)
    if (Number.isFinite(x) && (x <= -1 || x > READING_BOUNDS.maxRedshift))
      problem(
        ['shift', 'redshift'],
        'impossible-value',
        `a redshift of ${x} is outside what lines are measured at (above -1, at most ${READING_BOUNDS.maxRedshift})`,
        'check the number (a redshift z, not a velocity)',
      );
}
