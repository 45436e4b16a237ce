/**
 * Lines of one-electron spectra (H I, He II) from the Rydberg formula with the reduced mass,
 * plus the fine structure to order α², averaged over each level's states. Pure.
 *
 * Level n (Dirac, leading order): E = −R_M Z²/n² − R_M Z⁴α²/n⁴ · (n/(j+½) − ¾). Averaged over
 * the 2n² states of n (weight 2j+1), n/(j+½) becomes 2 − 1/n, so the mean level is
 * −R_M Z²/n² − R_M Z⁴α² (5/4 − 1/n)/n⁴. A line's position is the difference of the two mean
 * levels: at our resolutions (≥ 0.05 nm) its components (spread over ≤ 0.01 nm for H I's
 * Balmer lines, ≤ 0.03 nm for He II 468.6 nm) are one line, and the mean puts its centre within
 * the spread. The spread of the lower level's j-components, halved, is written as the
 * uncertainty. The Lamb shift (≈ 10⁻⁵ of the fine structure's effect here) is left out.
 */
import {
  ELECTRON_ALPHA_MASS_RATIO,
  ELECTRON_PROTON_MASS_RATIO,
  FINE_STRUCTURE_CONSTANT,
  RYDBERG_INFINITY_PER_M,
} from '../constants.js';
import { vacuumToAir } from '../reduce/airVacuum.js';

export interface HydrogenicSpectrum {
  species: string;
  /** Nuclear charge. */
  z: number;
  /** mₑ / m_nucleus, for the reduced-mass Rydberg constant R_M = R∞ / (1 + mₑ/M). */
  electron_nucleus_mass_ratio: number;
  /** Lower levels of the series to list. */
  lower_levels: readonly number[];
  /** Highest upper level listed. */
  max_upper_level: number;
}

export const HYDROGENIC_SPECTRA: readonly HydrogenicSpectrum[] = [
  {
    species: 'H I',
    z: 1,
    electron_nucleus_mass_ratio: ELECTRON_PROTON_MASS_RATIO,
    lower_levels: [2, 3],
    max_upper_level: 20,
  },
  {
    species: 'He II',
    z: 2,
    electron_nucleus_mass_ratio: ELECTRON_ALPHA_MASS_RATIO,
    lower_levels: [3, 4, 5],
    max_upper_level: 20,
  },
];

export interface HydrogenicLine {
  species: string;
  n_lower: number;
  n_upper: number;
  vacuum_nm: number;
  /** null below 200 nm. */
  air_nm: number | null;
  unc_nm: number;
  /**
   * A ranking rule, not a measurement: 10⁶ / (n_lower³ · n_upper³). Within a series line
   * strengths fall roughly as n_upper⁻³ (common practice, the asymptotic hydrogenic scaling);
   * the factor n_lower⁻³ puts the higher series below the lower.
   */
  intensity: number;
}

/** Mean energy of level n below the ionisation limit, per metre (a wavenumber, negative). */
function meanLevel_per_m(n: number, z: number, rydberg_per_m: number): number {
  const a2 = FINE_STRUCTURE_CONSTANT ** 2;
  return -(rydberg_per_m * z * z) / (n * n) - (rydberg_per_m * z ** 4 * a2 * (5 / 4 - 1 / n)) / n ** 4;
}

/** Every line of the spectrum's series with a vacuum wavelength in [from_nm, to_nm]. */
export function hydrogenicLines(spec: HydrogenicSpectrum, from_nm: number, to_nm: number): HydrogenicLine[] {
  const rydberg_per_m = RYDBERG_INFINITY_PER_M / (1 + spec.electron_nucleus_mass_ratio);
  const a2 = FINE_STRUCTURE_CONSTANT ** 2;
  const out: HydrogenicLine[] = [];
  for (const nl of spec.lower_levels) {
    for (let nu = nl + 1; nu <= spec.max_upper_level; nu++) {
      const sigma_per_m =
        meanLevel_per_m(nu, spec.z, rydberg_per_m) - meanLevel_per_m(nl, spec.z, rydberg_per_m);
      const vacuum_nm = 1e9 / sigma_per_m;
      if (vacuum_nm < from_nm || vacuum_nm > to_nm) continue;
      // Half the spread of the lower level's j-components: R_M Z⁴α² (n − 1)/n⁴, as a wavelength.
      const spread_per_m = (rydberg_per_m * spec.z ** 4 * a2 * (nl - 1)) / nl ** 4;
      const unc_nm = (vacuum_nm * vacuum_nm * 1e-9 * spread_per_m) / 2;
      out.push({
        species: spec.species,
        n_lower: nl,
        n_upper: nu,
        vacuum_nm,
        air_nm: vacuum_nm < 200 ? null : vacuumToAir(vacuum_nm),
        unc_nm,
        intensity: Math.max(1, Math.round(1e6 / (nl ** 3 * nu ** 3))),
      });
    }
  }
  return out.sort((a, b) => a.vacuum_nm - b.vacuum_nm);
}
