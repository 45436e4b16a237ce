/**
 * The warning that a reading's uncertainty was assumed, not given: the σ sets the
 * identification windows and the error bars, so the reader must know it is a default.
 * Once per session, at measurement.sigma (or the first line without one).
 */
import type { Diagnostic } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import type { Session } from '../session/types.js';

/**
 * `defaultText` says the default in the reading's own unit, such as "1′ (0.017°) per angle".
 * `pointsWithout` counts calibration points that also fall back to it.
 */
export function assumedSigmaWarning(
  session: Session,
  defaultText: string,
  pointsWithout = 0,
): Diagnostic | null {
  if (session.measurement.sigma !== null) return null;
  const without = session.lines.filter((l) => l.sigma === null);
  if (without.length === 0 && pointsWithout === 0) return null;
  const inFile = session.field_positions.measurement !== undefined;
  const position =
    inFile || !without[0] ? positionOfField(session, 'measurement.sigma') : without[0].position;
  const total = session.lines.length;
  const lines =
    without.length === 0
      ? ''
      : without.length === total
        ? 'any line'
        : `${without.length} of the ${total} lines`;
  const points =
    pointsWithout === 0 ? '' : `${pointsWithout} calibration line${pointsWithout === 1 ? '' : 's'}`;
  const what = [lines, points].filter(Boolean).join(' or ');
  return {
    file: session.file,
    ...position,
    severity: 'warning',
    code: 'assumed-sigma',
    field: inFile || !without[0] ? 'measurement.sigma' : `lines[${without[0].index}]`,
    message: `no reading uncertainty given for ${what}; assuming σ = ${defaultText}`,
    hint: 'set measurement.sigma (or sigma: on a line) to what your readings are good to: it sets the error bars and how far identification looks',
  };
}
