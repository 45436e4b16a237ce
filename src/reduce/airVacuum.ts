/**
 * Air ↔ vacuum wavelengths with the IAU standard (Morton 2000, ApJS 130, 403, eq. 3), which is
 * Edlén's 1966 formula as refitted by Birch & Downs (1994) for dry air at 15 °C, 101 325 Pa,
 * 450 ppm CO₂. We chose it over Ciddor 1996 because it is the convention NIST ASD and most
 * published line lists use for their air wavelengths, so our conversions reproduce the
 * catalog's own pairs; the two agree to about 1e-4 nm in the visible. Defined above 200 nm.
 */
import { AIR_CONVERSION_MIN_NM } from '../constants.js';

/** Refractive index of standard air, n − 1, at the given vacuum wavelength (nm). */
export function airRefractivityAtVacuum(vacuum_nm: number): number {
  const s = 1e3 / vacuum_nm; // wavenumber in 1/µm (Morton's σ = 10⁴/λ[Å])
  const s2 = s * s;
  return 8.34254e-5 + 2.406147e-2 / (130 - s2) + 1.5998e-4 / (38.9 - s2);
}

/** Vacuum → air. Below 200 nm air wavelengths are not defined: the value is returned unchanged. */
export function vacuumToAir(vacuum_nm: number): number {
  if (vacuum_nm < AIR_CONVERSION_MIN_NM) return vacuum_nm;
  return vacuum_nm / (1 + airRefractivityAtVacuum(vacuum_nm));
}

/**
 * Air → vacuum, the exact inverse of `vacuumToAir` by fixed-point iteration
 * (λ_vac = λ_air · n(λ_vac)); it converges to 1e-12 nm in four steps in the optical.
 */
export function airToVacuum(air_nm: number): number {
  if (air_nm < AIR_CONVERSION_MIN_NM) return air_nm;
  let vacuum = air_nm * (1 + airRefractivityAtVacuum(air_nm));
  for (let i = 0; i < 6; i++) {
    const next = air_nm * (1 + airRefractivityAtVacuum(vacuum));
    if (Math.abs(next - vacuum) < 1e-12) return next;
    vacuum = next;
  }
  return vacuum;
}

/** d(λ_vac)/d(λ_air), for carrying an air-wavelength sigma over to vacuum (≈ 1.0003). */
export function vacuumPerAirSlope(air_nm: number): number {
  const h = 1e-3;
  return (airToVacuum(air_nm + h) - airToVacuum(air_nm - h)) / (2 * h);
}
