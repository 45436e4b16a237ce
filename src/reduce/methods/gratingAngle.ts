/**
 * Method `grating-angle`: diffraction angles read off a spectrometer table.
 * θ is either read directly (angle_deg, from the zeroth order), or from the two sides of the
 * zeroth order (angle_left_deg, angle_right_deg) as θ = |L − R| / 2, which cancels the table's
 * unknown zero offset. Then the grating equation (see ../grating.ts).
 */

import type { Diagnostic } from '../../diagnostics.js';
import type { RawLine, Session } from '../../session/types.js';
import { assumedSigmaWarning } from '../assumedSigma.js';
import {
  formatDegMin,
  type GratingSetup,
  gratingSetupOf,
  lineDiagnostic,
  lineOrder,
  solveGratingEquation,
  unexplainedReading,
} from '../grating.js';
import type { MethodResult, ObservedReading } from '../types.js';

/**
 * One arcminute: the least count of the vernier on a typical student spectrometer table, and
 * the usual uncertainty quoted for one setting of the cross-hair (common practice).
 */
export const DEFAULT_ANGLE_SIGMA_DEG = 1 / 60;

interface AngleReading {
  theta_deg: number;
  sigma_deg: number;
  field: string;
  text: string;
  /** Two-sided readings measure |θ|, so the order's sign does not apply. */
  twoSided: boolean;
}

export function reduceGratingAngles(session: Session): MethodResult {
  const { setup, diagnostics } = gratingSetupOf(session);
  const assumed = assumedSigmaWarning(
    session,
    `${DEFAULT_ANGLE_SIGMA_DEG * 60}′ (${DEFAULT_ANGLE_SIGMA_DEG.toFixed(3)}°) per angle reading`,
  );
  if (assumed) diagnostics.push(assumed);
  const readings: ObservedReading[] = [];
  if (setup) {
    for (const line of session.lines) {
      const reading = readAngle(session, line, diagnostics);
      const order = lineOrder(session, line, diagnostics);
      if (!reading || order === null) continue;
      const lineSetup: GratingSetup = { ...setup, order: reading.twoSided ? Math.abs(order) : order };
      const solution = solveGratingEquation(lineSetup, reading.theta_deg, reading.sigma_deg);
      if (!solution.ok) {
        diagnostics.push(
          unexplainedReading(session, line, reading.field, lineSetup, reading.theta_deg, solution),
        );
        continue;
      }
      readings.push({
        index: line.index,
        wavelength_nm: solution.wavelength_nm,
        sigma_nm: solution.sigma_nm,
        reading_text: `${reading.text}, m = ${lineSetup.order}`,
      });
    }
  }
  return {
    readings,
    calibration: null,
    description: {
      formula: 'm·λ = d·(sin α + sin β),  β = θ − α',
      text:
        `Diffraction angles θ were read from the zeroth order on a ${session.measurement.grating?.type ?? 'transmission'} grating ` +
        `(d = ${setup ? setup.spacing_nm.toFixed(2) : '?'} nm, incidence α = ${session.measurement.incidence_deg}°). ` +
        'Where both sides were read, θ = |L − R| / 2, which cancels the zero of the table. ' +
        'Each wavelength follows from the grating equation; its uncertainty combines the angle reading and the groove spacing.',
    },
    diagnostics,
  };
}

function readAngle(session: Session, line: RawLine, diagnostics: Diagnostic[]): AngleReading | null {
  // The line's own sigma wins over the session default, as for every other method.
  const sigma_deg = line.sigma ?? session.measurement.sigma ?? DEFAULT_ANGLE_SIGMA_DEG;
  if (line.angle_deg !== null) {
    return {
      theta_deg: line.angle_deg,
      sigma_deg,
      field: 'angle_deg',
      text: `θ = ${formatDegMin(line.angle_deg)}`,
      twoSided: false,
    };
  }
  const left = line.angle_left_deg;
  const right = line.angle_right_deg;
  if (left === null || right === null) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        '',
        'missing-key',
        'this line has no angle',
        'add angle_deg, or angle_left_deg and angle_right_deg',
      ),
    );
    return null;
  }
  // A circular table may pass through 0°/360° between the two settings: take the short way round.
  const raw = Math.abs(left - right) % 360;
  const theta_deg = Math.min(raw, 360 - raw) / 2;
  if (session.measurement.incidence_deg !== 0) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        'angle_left_deg',
        'asymmetric-incidence',
        `θ = |L − R| / 2 assumes normal incidence; with α = ${session.measurement.incidence_deg}° the two sides are not symmetric`,
        'read angle_deg from the zeroth order instead, or set the grating normal to the beam',
        'warning',
      ),
    );
  }
  // θ is half a difference of two readings of equal σ: σ_θ = √2·σ / 2.
  return {
    theta_deg,
    sigma_deg: sigma_deg / Math.SQRT2,
    field: 'angle_left_deg',
    text: `L = ${formatDegMin(left)}, R = ${formatDegMin(right)} → θ = ${formatDegMin(theta_deg)}`,
    twoSided: true,
  };
}
