/** Outlier-resistant summaries, so that one bad calibration line cannot hide itself. */

/** Scale factor that makes the median absolute deviation estimate σ for Gaussian data: 1/Φ⁻¹(3/4). */
const MAD_TO_SIGMA = 1.482_6;

export function median(values: readonly number[]): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/** Robust standard deviation: 1.4826 × median |x − median(x)|. */
export function robustScatter(values: readonly number[]): number {
  const m = median(values);
  return MAD_TO_SIGMA * median(values.map((v) => Math.abs(v - m)));
}
