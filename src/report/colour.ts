/**
 * The colour a person would see at a wavelength, for the band along the charts' wavelength
 * axis. CIE 1931 2° colour-matching functions from the multi-lobe Gaussian fit of Wyman, Sloan
 * & Shirley (2013), "Simple Analytic Approximations to the CIE XYZ Color Matching Functions",
 * JCGT 2(2), 1–11 (coefficients from memory of that paper's eq. 2), then XYZ → linear sRGB with
 * the IEC 61966-2-1 matrix, out-of-gamut colours desaturated toward white, sRGB-encoded.
 */

function lobe(x: number, mu: number, s1: number, s2: number): number {
  const t = (x - mu) / (x < mu ? s1 : s2);
  return Math.exp(-0.5 * t * t);
}

export function cie1931(wavelength_nm: number): [number, number, number] {
  const l = wavelength_nm;
  const x =
    1.056 * lobe(l, 599.8, 37.9, 31.0) +
    0.362 * lobe(l, 442.0, 16.0, 26.7) -
    0.065 * lobe(l, 501.1, 20.4, 26.2);
  const y = 0.821 * lobe(l, 568.8, 46.9, 40.5) + 0.286 * lobe(l, 530.9, 16.3, 31.1);
  const z = 1.217 * lobe(l, 437.0, 11.8, 36.0) + 0.681 * lobe(l, 459.0, 26.0, 13.8);
  return [x, y, z];
}

function encode(c: number): number {
  const v = c <= 0.0031308 ? 12.92 * c : 1.055 * c ** (1 / 2.4) - 0.055;
  return Math.round(Math.max(0, Math.min(1, v)) * 255);
}

/** `#rrggbb` for a wavelength; outside about 380–750 nm the eye sees (next to) nothing: dark grey. */
export function wavelengthToHex(wavelength_nm: number): string {
  const [X, Y, Z] = cie1931(wavelength_nm);
  let r = 3.2406 * X - 1.5372 * Y - 0.4986 * Z;
  let g = -0.9689 * X + 1.8758 * Y + 0.0415 * Z;
  let b = 0.0557 * X - 0.204 * Y + 1.057 * Z;
  const lowest = Math.min(r, g, b, 0);
  r -= lowest;
  g -= lowest;
  b -= lowest;
  const peak = Math.max(r, g, b);
  if (peak <= 1e-4) return '#222222';
  // Brightness follows the luminance Y so the ends of the spectrum fade as they do to the eye.
  const scale = Math.min(1, Y * 1.6 + 0.15) / peak;
  const hex = [r, g, b]
    .map((c) =>
      encode(c * scale)
        .toString(16)
        .padStart(2, '0'),
    )
    .join('');
  return `#${hex}`;
}

/**
 * Okabe & Ito (2008), "Color Universal Design", a palette colour-blind readers can tell apart
 * (hex values from memory). Black is left out: it is the measured lines' colour.
 */
export const SPECIES_PALETTE = [
  '#0072B2',
  '#D55E00',
  '#009E73',
  '#CC79A7',
  '#E69F00',
  '#56B4E9',
  '#F0E442',
] as const;
