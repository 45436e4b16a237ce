/**
 * Method `screen`: maxima marked on a screen (or a wall) at distance L from the grating.
 * θ = atan(x / L) with x the offset from the central maximum, or x = s / 2 from the
 * separation s between the +m and −m maxima; then the grating equation (../grating.ts).
 */
import { DEG_PER_RAD } from '../../constants.js';
import type { Diagnostic } from '../../diagnostics.js';
import type { RawLine, Session } from '../../session/types.js';
import { assumedSigmaWarning } from '../assumedSigma.js';
import {
  type GratingSetup,
  gratingSetupOf,
  lineDiagnostic,
  lineOrder,
  measurementDiagnostic,
  solveGratingEquation,
  unexplainedReading,
} from '../grating.js';
import type { MethodResult, ObservedReading } from '../types.js';

/** A maximum marked by eye on a screen is usually good to about a millimetre (common practice). */
export const DEFAULT_SCREEN_SIGMA_MM = 1;

interface ScreenReading {
  x_mm: number;
  sigma_x_mm: number;
  field: string;
  text: string;
  twoSided: boolean;
}

export function reduceScreen(session: Session): MethodResult {
  const { setup, diagnostics } = gratingSetupOf(session);
  const distance_mm = session.measurement.screen_distance_mm;
  const distanceSigma_mm = session.measurement.screen_distance_sigma_mm;
  if (distance_mm === null || !(distance_mm > 0) || !Number.isFinite(distance_mm)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.screen_distance_mm',
        'invalid-value',
        `the screen distance must be a positive length, not ${distance_mm}`,
        'measure the grating-to-screen distance in mm',
      ),
    );
  }
  if (!(distanceSigma_mm >= 0)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.screen_distance_sigma_mm',
        'invalid-value',
        'the distance uncertainty must not be negative',
        'give a sigma of 0 or more',
      ),
    );
  }
  const assumed = assumedSigmaWarning(session, `${DEFAULT_SCREEN_SIGMA_MM} mm per screen position`);
  if (assumed) diagnostics.push(assumed);
  const readings: ObservedReading[] = [];
  if (setup && distance_mm !== null && distance_mm > 0 && distanceSigma_mm >= 0) {
    for (const line of session.lines) {
      const reading = readScreen(session, line, diagnostics);
      const order = lineOrder(session, line, diagnostics);
      if (!reading || order === null) continue;
      const lineSetup: GratingSetup = { ...setup, order: reading.twoSided ? Math.abs(order) : order };
      const x = reading.x_mm;
      const L = distance_mm;
      const theta_deg = Math.atan2(x, L) * DEG_PER_RAD;
      // θ = atan(x/L): ∂θ/∂x = L/(x²+L²), ∂θ/∂L = −x/(x²+L²)  (radians per mm).
      const r2 = x * x + L * L;
      const sigmaTheta_deg = (Math.hypot(L * reading.sigma_x_mm, x * distanceSigma_mm) / r2) * DEG_PER_RAD;
      const solution = solveGratingEquation(lineSetup, theta_deg, sigmaTheta_deg);
      if (!solution.ok) {
        diagnostics.push(unexplainedReading(session, line, reading.field, lineSetup, theta_deg, solution));
        continue;
      }
      readings.push({
        index: line.index,
        wavelength_nm: solution.wavelength_nm,
        sigma_nm: solution.sigma_nm,
        reading_text: `${reading.text}, L = ${L} mm → θ = ${theta_deg.toFixed(3)}°, m = ${lineSetup.order}`,
      });
    }
  }
  return {
    readings,
    calibration: null,
    description: {
      formula: 'θ = atan(x / L);  m·λ = d·(sin α + sin β),  β = θ − α',
      text:
        `Maxima were marked on a screen ${distance_mm ?? '?'} mm from the grating (d = ${setup ? setup.spacing_nm.toFixed(2) : '?'} nm). ` +
        'The angle of each follows from its offset x from the central maximum (half the separation of the ±m maxima where both were marked), ' +
        'then the wavelength from the grating equation; the uncertainty combines the offset, the screen distance and the groove spacing.',
    },
    diagnostics,
  };
}

function readScreen(session: Session, line: RawLine, diagnostics: Diagnostic[]): ScreenReading | null {
  const sigma_mm = line.sigma ?? session.measurement.sigma ?? DEFAULT_SCREEN_SIGMA_MM;
  if (line.offset_mm !== null) {
    return {
      x_mm: line.offset_mm,
      sigma_x_mm: sigma_mm,
      field: 'offset_mm',
      text: `x = ${line.offset_mm} mm`,
      twoSided: false,
    };
  }
  const s = line.separation_mm;
  if (s === null) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        '',
        'missing-key',
        'this line has no screen position',
        'add offset_mm or separation_mm',
      ),
    );
    return null;
  }
  if (!(s > 0)) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        'separation_mm',
        'invalid-value',
        `a separation must be positive, not ${s} mm`,
        'measure between the +m and −m maxima',
      ),
    );
    return null;
  }
  if (session.measurement.incidence_deg !== 0) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        'separation_mm',
        'asymmetric-incidence',
        `x = s / 2 assumes normal incidence; with α = ${session.measurement.incidence_deg}° the ±m maxima are not symmetric`,
        'mark offset_mm from the central maximum instead',
        'warning',
      ),
    );
  }
  // x = s/2, so σ_x = σ_s/2 (σ_s is the uncertainty of the one separation measurement).
  return {
    x_mm: s / 2,
    sigma_x_mm: sigma_mm / 2,
    field: 'separation_mm',
    text: `s = ${s} mm (x = s/2)`,
    twoSided: true,
  };
}
