/**
 * Reduced wavelengths the instrument cannot have measured, with the slip that explains them:
 * readings in Ångström under `unit: nm` (4047 for 404.7), or a line seen in the second order
 * left at `order: 1` (546 nm reduced as 1092 nm). Warnings, not errors: an instrument may reach
 * further than the rule of thumb. Pure: a reduction in, diagnostics out.
 */
import type { Diagnostic } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import { NM_PER_UNIT } from './methods/wavelength.js';
import type { MeasuredLine, Reduction } from './types.js';

/**
 * What a camera behind a small grating measures when the range is not stated: from the near
 * ultraviolet that glass optics pass to the near infrared where silicon sensors stop responding
 * (common practice). Also used for wavelengths given as read, whatever read them.
 */
export const COMMON_RANGE_NM: readonly [number, number] = [300, 1100];

/**
 * What the eye sees, for positions read by eye (a spectrometer's cross-hair, a mark on a
 * screen): the usual visible band (common practice; the eye's response is tabulated from
 * 360 to 830 nm, from memory, but is very faint beyond these ends).
 */
export const VISIBLE_RANGE_NM: readonly [number, number] = [380, 780];

/** Orders tried when a line lies outside the range (higher orders are rarely read). */
const ORDERS_TRIED = [1, 2, 3, 4] as const;

type Unit = keyof typeof NM_PER_UNIT;
const UNIT_NAME: Record<Unit, string> = { nm: 'nm', angstrom: 'Ångström', um: 'µm' };

const fmt = (nm: number) => `${nm.toFixed(1)} nm`;

/** The line's wavelength as the instrument saw it: observed frame, in the session's medium. */
function observedNm(reduction: Reduction, line: MeasuredLine): number {
  return reduction.medium === 'air' ? line.air_nm : line.vacuum_nm;
}

export function outOfRangeWarnings(reduction: Reduction): Diagnostic[] {
  const session = reduction.session;
  const stated = session.instrument.range_nm;
  const method = session.measurement.method;
  const byEye = method === 'grating-angle' || method === 'screen';
  const [lo, hi] = stated ?? (byEye ? VISIBLE_RANGE_NM : COMMON_RANGE_NM);
  const inRange = (nm: number) => nm >= lo && nm <= hi;
  const where = stated
    ? `outside the instrument's range (${lo}–${hi} nm)`
    : byEye
      ? `outside ${lo}–${hi} nm, what the eye sees (common practice; state instrument.range_nm if you read it otherwise)`
      : `outside ${lo}–${hi} nm, roughly what a grating and camera measure (common practice; state instrument.range_nm if yours reaches further)`;
  // Outside by more than 3σ, so that a line at the very edge of a stated range is not called out.
  const outside = reduction.lines.filter((l) => {
    const nm = observedNm(reduction, l);
    return nm + 3 * l.sigma_nm < lo || nm - 3 * l.sigma_nm > hi;
  });
  if (outside.length === 0) return [];

  const unit = session.measurement.unit;
  // The unit scales every wavelength the reduction gives (readings or calibration lines).
  const unitFor = (nms: readonly number[]): Unit | undefined =>
    method === 'wavelength' || method === 'pixel'
      ? (Object.keys(NM_PER_UNIT) as Unit[]).find(
          (u) => u !== unit && nms.every((nm) => inRange((nm * NM_PER_UNIT[u]) / NM_PER_UNIT[unit])),
        )
      : undefined;
  const unitFix = unitFor(outside.map((l) => observedNm(reduction, l)));
  const byIndex = new Map(session.lines.map((l) => [l.index, l]));

  if (unitFix && outside.length === reduction.lines.length) {
    const first = outside[0]!;
    const scale = NM_PER_UNIT[unitFix] / NM_PER_UNIT[unit];
    const raw = byIndex.get(first.index)?.wavelength;
    const example =
      method === 'wavelength' && raw != null
        ? `${raw} looks like ${UNIT_NAME[unitFix]}: ${fmt(observedNm(reduction, first) * scale)}`
        : `in ${UNIT_NAME[unitFix]} the first line would be at ${fmt(observedNm(reduction, first) * scale)}`;
    const span = outside.map((l) => observedNm(reduction, l));
    const inFile = session.field_positions['measurement.unit'] !== undefined;
    return [
      {
        file: session.file,
        ...(inFile ? positionOfField(session, 'measurement.unit') : first.position),
        severity: 'warning',
        code: 'out-of-range',
        field: inFile ? 'measurement.unit' : `lines[${first.index}]`,
        message: `every line reduces to ${outside.length === 1 ? fmt(span[0]!) : `${fmt(Math.min(...span))} … ${fmt(Math.max(...span))}`}, ${where}`,
        hint: `${example} — set measurement.unit: ${unitFix}`,
      },
    ];
  }

  return outside.map((l): Diagnostic => {
    const nm = observedNm(reduction, l);
    const raw = byIndex.get(l.index);
    let hint = `check the reading, the grating and measurement.unit (${unit})`;
    if (method !== 'wavelength' && raw && l.combined_indices.length === 0) {
      const m = raw.order ?? session.measurement.order;
      const sign = Math.sign(m) || 1;
      const tried = ORDERS_TRIED.map((k) => k * sign)
        .filter((k) => k !== m)
        .sort((a, b) => Math.abs(a - m) - Math.abs(b - m));
      const order = tried.find((k) => inRange((nm * m) / k));
      if (order !== undefined)
        hint = `order ${order} would give ${fmt((nm * m) / order)} — if the line was seen in order ${order}, set order: ${order} on it`;
    } else if (method === 'wavelength') {
      const u = unitFor([nm]);
      if (u && raw?.wavelength != null)
        hint = `${raw.wavelength} looks like ${UNIT_NAME[u]}: ${fmt((nm * NM_PER_UNIT[u]) / NM_PER_UNIT[unit])} — write it in ${unit}, as the other lines are`;
    }
    return {
      file: session.file,
      ...l.position,
      severity: 'warning',
      code: 'out-of-range',
      field: `lines[${l.index}]`,
      message: `reduces to ${fmt(nm)}, ${where}`,
      hint,
    };
  });
}
