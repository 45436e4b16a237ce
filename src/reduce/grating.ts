/**
 * The grating equation, m·λ = d·(sin α + sin β), shared by the angle, screen and slitless
 * pixel methods.
 *
 * Sign convention (one for both grating types): α and β are measured from the grating normal
 * and are positive on the same side of it; α is the direction *towards the source*, β the
 * direction of the diffracted beam. The zeroth order then leaves at β₀ = −α — straight through
 * a transmission grating, the mirror reflection off a reflection grating — and a reading θ
 * taken from that zeroth-order direction gives β = θ − α. So for a reflection grating β is
 * positive on the source's side of the normal, and at normal incidence both types reduce to
 * m·λ = d·sin θ. Positive orders lie on the side of positive angles.
 */

import { RAD_PER_DEG } from '../constants.js';
import type { Diagnostic } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import type { RawLine, Session } from '../session/types.js';

export interface GratingSetup {
  spacing_nm: number;
  spacing_sigma_nm: number;
  order: number;
  incidence_deg: number;
}

export type GratingSolution =
  | { ok: true; wavelength_nm: number; sigma_nm: number; beta_deg: number }
  /** `beyond-grazing`: β would be at or past ±90°, so no beam leaves in that direction. */
  | { ok: false; reason: 'beyond-grazing' | 'non-positive'; beta_deg: number; wavelength_nm: number };

/**
 * λ from a reading θ (degrees from the zeroth order) with σ_θ (degrees).
 * σ_λ² = (d·cos β·σ_θ / m)² + (λ·σ_d / d)²   (σ_θ in radians; first order).
 */
export function solveGratingEquation(
  setup: GratingSetup,
  theta_deg: number,
  theta_sigma_deg: number,
): GratingSolution {
  const beta_deg = theta_deg - setup.incidence_deg;
  const alpha = setup.incidence_deg * RAD_PER_DEG;
  const beta = beta_deg * RAD_PER_DEG;
  const wavelength_nm = (setup.spacing_nm * (Math.sin(alpha) + Math.sin(beta))) / setup.order;
  if (Math.abs(beta_deg) >= 90) return { ok: false, reason: 'beyond-grazing', beta_deg, wavelength_nm };
  if (!(wavelength_nm > 0)) return { ok: false, reason: 'non-positive', beta_deg, wavelength_nm };
  const fromAngle = ((setup.spacing_nm * Math.cos(beta)) / setup.order) * theta_sigma_deg * RAD_PER_DEG;
  const fromSpacing = (wavelength_nm * setup.spacing_sigma_nm) / setup.spacing_nm;
  return { ok: true, wavelength_nm, sigma_nm: Math.hypot(fromAngle, fromSpacing), beta_deg };
}

/**
 * The inverse: the diffraction angle β (degrees from the normal) of λ in order m, or null when
 * |sin β| would exceed 1 — that order of that wavelength does not exist.
 */
export function diffractionAngleDeg(setup: GratingSetup, wavelength_nm: number): number | null {
  const sinBeta =
    (setup.order * wavelength_nm) / setup.spacing_nm - Math.sin(setup.incidence_deg * RAD_PER_DEG);
  if (Math.abs(sinBeta) > 1) return null;
  return Math.asin(sinBeta) / RAD_PER_DEG;
}

/** Longest wavelength order m can show: |sin β| ≤ 1 gives λ ≤ d·(1 + |sin α|)/|m|. */
export function longestWavelengthNm(setup: GratingSetup): number {
  return (
    (setup.spacing_nm * (1 + Math.abs(Math.sin(setup.incidence_deg * RAD_PER_DEG)))) / Math.abs(setup.order)
  );
}

/** A diagnostic about one line, positioned at the line in the file. */
export function lineDiagnostic(
  session: Session,
  line: RawLine,
  field: string,
  code: string,
  message: string,
  hint: string,
  severity: Diagnostic['severity'] = 'error',
): Diagnostic {
  return {
    file: session.file,
    line: line.position.line,
    col: line.position.col,
    severity,
    code,
    field: `lines[${line.index}]${field ? `.${field}` : ''}`,
    message,
    hint,
  };
}

/**
 * A diagnostic about the measurement block. The Session keeps no positions for it, so it
 * points at the top of the file.
 */
export function measurementDiagnostic(
  session: Session,
  field: string,
  code: string,
  message: string,
  hint: string,
  severity: Diagnostic['severity'] = 'error',
): Diagnostic {
  return { file: session.file, ...positionOfField(session, field), severity, code, field, message, hint };
}

/** Checks every grating method needs before it reads a line; returns the setup or diagnostics. */
export function gratingSetupOf(session: Session): { setup: GratingSetup | null; diagnostics: Diagnostic[] } {
  const g = session.measurement.grating;
  const diagnostics: Diagnostic[] = [];
  if (!g) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.grating',
        'missing-key',
        `method ${session.measurement.method} needs the grating`,
        'add grating: { lines_per_mm: 300 }',
      ),
    );
    return { setup: null, diagnostics };
  }
  if (!(g.spacing_nm > 0) || !Number.isFinite(g.spacing_nm)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.grating',
        'invalid-value',
        `the groove spacing must be positive, not ${g.spacing_nm} nm`,
        'give lines_per_mm or spacing_um greater than 0',
      ),
    );
  }
  if (!(g.spacing_sigma_nm >= 0)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.grating',
        'invalid-value',
        'the spacing uncertainty must not be negative',
        'give a sigma of 0 or more',
      ),
    );
  }
  if (!Number.isInteger(session.measurement.order) || session.measurement.order === 0) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.order',
        'invalid-value',
        `order ${session.measurement.order} carries no wavelength information`,
        'use a non-zero whole number such as 1 or −1',
      ),
    );
  }
  if (!(Math.abs(session.measurement.incidence_deg) < 90)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.incidence_deg',
        'invalid-value',
        `an incidence of ${session.measurement.incidence_deg}° does not reach the grating`,
        'give the angle between the incoming beam and the grating normal, below 90°',
      ),
    );
  }
  if (diagnostics.length > 0) return { setup: null, diagnostics };
  return {
    setup: {
      spacing_nm: g.spacing_nm,
      spacing_sigma_nm: g.spacing_sigma_nm,
      order: session.measurement.order,
      incidence_deg: session.measurement.incidence_deg,
    },
    diagnostics,
  };
}

/** The order of one reading: its own, else the session's; null (with a diagnostic) when 0. */
export function lineOrder(session: Session, line: RawLine, diagnostics: Diagnostic[]): number | null {
  const order = line.order ?? session.measurement.order;
  if (!Number.isInteger(order) || order === 0) {
    diagnostics.push(
      lineDiagnostic(
        session,
        line,
        'order',
        'invalid-value',
        `order ${order} carries no wavelength information`,
        'use a non-zero whole number',
      ),
    );
    return null;
  }
  return order;
}

/**
 * Turns a failed solution into a diagnostic naming the line, with a hint that fits the failure.
 * `reading` is the field that holds the position (`angle_deg`, `offset_mm`, …).
 */
export function unexplainedReading(
  session: Session,
  line: RawLine,
  reading: string,
  setup: GratingSetup,
  theta_deg: number,
  failure: Extract<GratingSolution, { ok: false }>,
): Diagnostic {
  if (failure.reason === 'beyond-grazing') {
    return lineDiagnostic(
      session,
      line,
      reading,
      'no-diffraction',
      `θ = ${theta_deg.toFixed(3)}° with incidence ${setup.incidence_deg}° puts the beam at β = ${failure.beta_deg.toFixed(3)}° from the normal: |sin β| cannot exceed 1`,
      'check the reading and measurement.incidence_deg (angles are read from the zeroth order)',
    );
  }
  return lineDiagnostic(
    session,
    line,
    reading,
    'order-sign',
    `θ = ${theta_deg.toFixed(3)}° in order ${setup.order} gives λ = ${failure.wavelength_nm.toFixed(3)} nm, which is not positive`,
    setup.order > 0
      ? 'a reading on the negative side needs a negative order (order: −1), or give the angle without its sign'
      : 'a negative order is read on the negative side: check the sign of the reading or of the order',
  );
}

/** 9.4290 → "9° 25.7′": how a table reading is written. */
export function formatDegMin(deg: number): string {
  const sign = deg < 0 ? '−' : '';
  const abs = Math.abs(deg);
  let whole = Math.floor(abs);
  let minutes = Math.round((abs - whole) * 600) / 10;
  if (minutes >= 60) {
    whole += 1;
    minutes -= 60;
  }
  return `${sign}${whole}° ${minutes.toFixed(1)}′`;
}
