/**
 * Doppler shifts. Observed = rest · (1 + z); for a radial velocity v the relativistic
 * (special-relativity, line-of-sight) relation 1 + z = √((1 + β)/(1 − β)), β = v/c.
 */
import { SPEED_OF_LIGHT_KM_S } from '../constants.js';

export function redshiftFromVelocity(velocity_km_s: number): number {
  const beta = velocity_km_s / SPEED_OF_LIGHT_KM_S;
  return Math.sqrt((1 + beta) / (1 - beta)) - 1;
}

export function velocityFromRedshift(z: number): number {
  const q = (1 + z) * (1 + z);
  return (SPEED_OF_LIGHT_KM_S * (q - 1)) / (q + 1);
}

/** dz/dv at v, to carry a velocity sigma into z. */
export function redshiftPerVelocity(velocity_km_s: number): number {
  const h = 1e-3;
  return (redshiftFromVelocity(velocity_km_s + h) - redshiftFromVelocity(velocity_km_s - h)) / (2 * h);
}

export function toRestFrame(observed_nm: number, z: number): number {
  return observed_nm / (1 + z);
}

/** A wavelength residual expressed as a velocity (first order), km/s. */
export function residualVelocity_km_s(residual_nm: number, wavelength_nm: number): number {
  return (SPEED_OF_LIGHT_KM_S * residual_nm) / wavelength_nm;
}

/**
 * Observed vacuum wavelength ± σ → rest frame for a shift z ± σ_z, first-order propagation:
 * σ_rest² = (σ_obs/(1+z))² + (λ_obs σ_z/(1+z)²)².
 */
export function restFrame(
  observed_nm: number,
  sigma_nm: number,
  z: number,
  z_sigma: number,
): { rest_nm: number; rest_sigma_nm: number } {
  return {
    rest_nm: observed_nm / (1 + z),
    rest_sigma_nm: Math.hypot(sigma_nm / (1 + z), (observed_nm * z_sigma) / (1 + z) ** 2),
  };
}
