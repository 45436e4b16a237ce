/** A known Doppler shift from the session (velocity or redshift), to remove before identification. */
import type { Outcome } from '../diagnostics.js';
import type { Session } from '../session/types.js';
import { redshiftFromVelocity, redshiftPerVelocity, velocityFromRedshift } from './doppler.js';
import type { AppliedShift } from './types.js';

export function resolveKnownShift(session: Session): Outcome<AppliedShift | null> {
  const s = session.shift;
  switch (s.mode) {
    case 'velocity': {
      const z = redshiftFromVelocity(s.velocity_km_s);
      return {
        ok: true,
        value: {
          source: 'velocity',
          z,
          z_sigma: Math.abs(redshiftPerVelocity(s.velocity_km_s)) * s.sigma_km_s,
          velocity_km_s: s.velocity_km_s,
          velocity_sigma_km_s: s.sigma_km_s,
          barycentric: null,
        },
        warnings: [],
      };
    }
    case 'redshift': {
      const v = velocityFromRedshift(s.z);
      const h = 1e-6;
      const dvdz = (velocityFromRedshift(s.z + h) - velocityFromRedshift(s.z - h)) / (2 * h);
      return {
        ok: true,
        value: {
          source: 'redshift',
          z: s.z,
          z_sigma: s.sigma,
          velocity_km_s: v,
          velocity_sigma_km_s: Math.abs(dvdz) * s.sigma,
          barycentric: null,
        },
        warnings: [],
      };
    }
    default:
      return { ok: true, value: null, warnings: [] };
  }
}
