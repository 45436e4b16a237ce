/**
 * Every physical constant the pipeline uses, once, with its source.
 * Other modules import from here; no constant is typed twice.
 */

/** Speed of light in vacuum, km/s. Exact by definition of the metre (SI 2019; CODATA 2018). */
export const SPEED_OF_LIGHT_KM_S = 299_792.458;

/** Rydberg constant R∞ in 1/m. CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010). */
export const RYDBERG_INFINITY_PER_M = 10_973_731.568_16;

/** Electron-to-proton mass ratio mₑ/mₚ. CODATA 2018. */
export const ELECTRON_PROTON_MASS_RATIO = 5.446_170_214_87e-4;

/**
 * Electron-to-alpha-particle mass ratio mₑ/mα (the ⁴He nucleus, for He II's reduced mass).
 * CODATA 2018 (Tiesinga et al. 2021, Rev. Mod. Phys. 93, 025010); value from memory, not read
 * from a stored copy (mα/mₑ = 7294.299 541 42).
 */
export const ELECTRON_ALPHA_MASS_RATIO = 1 / 7294.299_541_42;

/** Fine-structure constant α. CODATA 2018 (Tiesinga et al. 2021); value from memory. */
export const FINE_STRUCTURE_CONSTANT = 7.297_352_569_3e-3;

/** FWHM of a Gaussian in units of its standard deviation: 2·√(2 ln 2). Mathematical identity. */
export const FWHM_PER_SIGMA = 2 * Math.sqrt(2 * Math.LN2);

/** Nanometres per ångström and per micrometre (SI prefixes). */
export const NM_PER_ANGSTROM = 0.1;
export const NM_PER_MICROMETRE = 1000;

/** Air/vacuum conversion is defined only above this vacuum wavelength (IAU convention, Morton 2000). */
export const AIR_CONVERSION_MIN_NM = 200;

/** Astronomical unit in km. Exact by definition (IAU 2012 Resolution B2). */
export const KM_PER_AU = 149_597_870.7;

/** Seconds in one day of 86 400 SI seconds (the unit of astronomy-engine's AU/day velocities). */
export const SECONDS_PER_DAY = 86_400;

/** WGS 84 ellipsoid: equatorial radius (km) and flattening (NIMA TR8350.2, 3rd ed., 2000). */
export const WGS84_EQUATORIAL_RADIUS_KM = 6378.137;
export const WGS84_FLATTENING = 1 / 298.257_223_563;

/** Nominal mean angular velocity of the Earth's rotation, rad/s (IERS Conventions 2010; WGS 84). */
export const EARTH_ROTATION_RAD_S = 7.292_115e-5;

/** Angle units (mathematical identities). */
export const RAD_PER_DEG = Math.PI / 180;
export const DEG_PER_RAD = 180 / Math.PI;
