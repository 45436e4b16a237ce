/**
 * Which calibration line breaks the order of the others. A dispersion law is monotonic
 * (wavelength rises, or falls, steadily with pixel), so when the fit turns over the cause is
 * most often one line whose pixel or wavelength was written wrong: the one whose removal leaves
 * the rest in order.
 */

/** Strictly rising or strictly falling, in the order given. */
function monotonic(values: readonly number[]): boolean {
  let up = true;
  let down = true;
  for (let i = 1; i < values.length; i++) {
    if (!(values[i]! > values[i - 1]!)) up = false;
    if (!(values[i]! < values[i - 1]!)) down = false;
  }
  return up || down;
}

/** Residuals from the unweighted least-squares straight line through the points. */
function lineResiduals(x: readonly number[], y: readonly number[]): number[] {
  const n = x.length;
  const mx = x.reduce((a, v) => a + v, 0) / n;
  const my = y.reduce((a, v) => a + v, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i]! - mx) * (y[i]! - my);
    sxx += (x[i]! - mx) ** 2;
  }
  const slope = sxx > 0 ? sxy / sxx : 0;
  return y.map((v, i) => v - (my + slope * (x[i]! - mx)));
}

/**
 * The index (in the given order) of the point that breaks the order of wavelength with pixel,
 * or null when they are in order. Of the points whose removal leaves the rest in order (all
 * points when none does), the one farthest from a straight line through all of them.
 */
export function outOfOrderPoint(pixels: readonly number[], wavelengths: readonly number[]): number | null {
  const byPixel = pixels.map((_, i) => i).sort((a, b) => pixels[a]! - pixels[b]!);
  const ordered = byPixel.map((i) => wavelengths[i]!);
  if (monotonic(ordered)) return null;
  const fixing = byPixel.filter((_, k) => monotonic(ordered.filter((__, j) => j !== k)));
  const residuals = lineResiduals(pixels, wavelengths);
  const pool = fixing.length > 0 ? fixing : byPixel;
  return pool.reduce((best, i) => (Math.abs(residuals[i]!) > Math.abs(residuals[best]!) ? i : best));
}
