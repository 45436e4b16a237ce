/**
 * A known Doppler shift from the session (velocity or redshift), to remove before identification,
 * with the barycentric correction when the session asks for one.
 *
 * Convention: a given velocity_km_s (or redshift) is the source's *barycentric* radial velocity,
 * as catalogues list it. The lines were measured at the telescope, so the shift to remove is
 * the topocentric one, v_topo = v_bary − correction. We apply it exactly by multiplying the
 * Doppler factors, (1 + z_topo) = (1 + z_bary)·(1 + z(−correction)), which equals the
 * subtraction to first order (the difference is below 1 m/s for stars). The AppliedShift then
 * carries the topocentric z and velocity that were actually removed, and the correction itself.
 */

import type { Diagnostic, Outcome } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import type { Session } from '../session/types.js';
import { sessionBarycentricCorrection } from './barycentric.js';
import { redshiftFromVelocity, redshiftPerVelocity, velocityFromRedshift } from './doppler.js';
import type { AppliedShift, BarycentricCorrection } from './types.js';

/** dv/dz at z, to carry a redshift σ over to velocity (and back). */
function velocityPerRedshift(z: number): number {
  const h = 1e-6;
  return (velocityFromRedshift(z + h) - velocityFromRedshift(z - h)) / (2 * h);
}

/** Barycentric → topocentric redshift: remove the observer's own motion towards the target. */
export function topocentricRedshift(z_bary: number, correction_km_s: number): number {
  return (1 + z_bary) * (1 + redshiftFromVelocity(-correction_km_s)) - 1;
}

function applied(
  source: AppliedShift['source'],
  z_bary: number,
  z_sigma_bary: number,
  barycentric: BarycentricCorrection | null,
): AppliedShift {
  const z = barycentric ? topocentricRedshift(z_bary, barycentric.correction_km_s) : z_bary;
  // The correction is known to m/s: σ_z carries over by the (constant) factor dz_topo/dz_bary.
  const z_sigma = barycentric
    ? z_sigma_bary * (1 + redshiftFromVelocity(-barycentric.correction_km_s))
    : z_sigma_bary;
  return {
    source,
    z,
    z_sigma,
    velocity_km_s: velocityFromRedshift(z),
    velocity_sigma_km_s: Math.abs(velocityPerRedshift(z)) * z_sigma,
    barycentric,
  };
}

export function resolveKnownShift(session: Session): Outcome<AppliedShift | null> {
  const bary = sessionBarycentricCorrection(session);
  if (!bary.ok) return bary;
  const correction = bary.value;
  const warnings: Diagnostic[] = [];
  const s = session.shift;
  switch (s.mode) {
    case 'velocity': {
      const z = redshiftFromVelocity(s.velocity_km_s);
      const z_sigma = Math.abs(redshiftPerVelocity(s.velocity_km_s)) * s.sigma_km_s;
      return { ok: true, value: applied('velocity', z, z_sigma, correction), warnings };
    }
    case 'redshift':
      return { ok: true, value: applied('redshift', s.z, s.sigma, correction), warnings };
    case 'velocity-search':
    case 'redshift-search':
      // Nothing is removed here (z = 0); the correction travels with the record so that a
      // velocity found later by the search can be referred to the barycentre.
      return {
        ok: true,
        value: correction
          ? {
              source: 'search',
              z: 0,
              z_sigma: 0,
              velocity_km_s: 0,
              velocity_sigma_km_s: 0,
              barycentric: correction,
            }
          : null,
        warnings,
      };
    default:
      if (correction) {
        warnings.push({
          file: session.file,
          ...positionOfField(session, 'shift.barycentric'),
          severity: 'warning',
          code: 'barycentric-unused',
          field: 'shift.barycentric',
          message: `the barycentric correction (${correction.correction_km_s.toFixed(3)} km/s) was computed but there is no velocity to apply it to`,
          hint: 'give shift.velocity_km_s (barycentric) or a search range',
        });
      }
      return { ok: true, value: null, warnings };
  }
}
