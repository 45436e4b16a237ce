/**
 * The continuum under the lines and the noise of one point, both estimated from the profile
 * itself. The continuum is a running median (robust to lines narrower than half the window),
 * refined by masking the points that stand out as lines and taking the median of the rest —
 * iterative sigma clipping (common practice). The noise is the median absolute difference of
 * neighbouring residuals off the lines: for independent Gaussian noise σ, neighbour differences
 * have σ√2 and MAD = 0.6745·σ√2 (the normal quantile Φ⁻¹(3/4) = 0.6745, common practice).
 */
/** Median by a native numeric sort of a typed copy (several times faster than Array.sort). */
export function median(values: ArrayLike<number>): number {
  const n = values.length;
  if (n === 0) return Number.NaN;
  const sorted = Float64Array.from(values).sort();
  return n % 2 ? sorted[n >> 1]! : (sorted[(n >> 1) - 1]! + sorted[n >> 1]!) / 2;
}

/** 1/Φ⁻¹(3/4): the MAD of a normal variable times this is its σ. */
const MAD_TO_SIGMA = 1.482_6;
/** Runs of points further than this many σ on the line side are masked from the continuum (common practice). */
const CLIP_SIGMA = 3;
const ITERATIONS = 4;

export interface Continuum {
  /** Continuum value at each point. */
  level: number[];
  /** Points judged to be on a line (excluded from the continuum and the noise). */
  masked: boolean[];
  /** Noise of one point off the lines, in intensity units. */
  noise: number;
}

/** Noise from neighbour differences of `r` over points not masked (both ends free). */
export function differenceNoise(r: readonly number[], masked: readonly boolean[]): number {
  const d: number[] = [];
  for (let i = 1; i < r.length; i++) if (!masked[i] && !masked[i - 1]) d.push(Math.abs(r[i]! - r[i - 1]!));
  if (d.length < 4) for (let i = 1; i < r.length; i++) d.push(Math.abs(r[i]! - r[i - 1]!));
  const robust = (MAD_TO_SIGMA * median(d)) / Math.SQRT2;
  if (robust > 0) return robust;
  // Mostly equal neighbours (counts on a dark background are mostly 0): the median says 0, so
  // fall back to the root mean square, which the rare non-zero differences still lift.
  return Math.sqrt(d.reduce((s, v) => s + v * v, 0) / Math.max(1, d.length) / 2);
}

/**
 * The first pass is a running median (robust to the lines before any are known); later
 * passes fit a straight line to the unmasked points of each window.
 * `sign` +1 for emission (lines stand above the continuum), −1 for absorption.
 * `window` is in points; medians are taken at knots an eighth of a window apart and joined
 * by straight lines, which keeps a 4096-point profile to a few hundred medians.
 */
export function estimateContinuum(y: readonly number[], sign: 1 | -1, window: number): Continuum {
  const n = y.length;
  const half = Math.max(2, Math.floor(window / 2));
  const step = Math.max(1, Math.floor(window / 8));
  let masked = new Array<boolean>(n).fill(false);
  let level = new Array<number>(n).fill(0);
  let noise = 0;
  const buffer = new Float64Array(2 * half + 1);
  for (let it = 0; it < ITERATIONS; it++) {
    const knots: number[] = [];
    const values: number[] = [];
    for (let k = 0; ; k += step) {
      const i = Math.min(k, n - 1);
      const from = Math.max(0, i - half);
      const to = Math.min(n, i + half + 1);
      if (it === 0) {
        for (let j = from; j < to; j++) buffer[j - from] = y[j]!;
        // A typed array sorts numerically in native code: the running median stays cheap.
        const all = buffer.subarray(0, to - from).sort();
        const count = to - from;
        knots.push(i);
        values.push(count % 2 ? all[count >> 1]! : (all[(count >> 1) - 1]! + all[count >> 1]!) / 2);
      } else {
        // With the lines masked, a straight line through the rest of the window: unlike a
        // median it stays unbiased on a sloping continuum when the mask is lopsided (beside
        // a line, at the ends).
        let k = 0;
        let sx = 0;
        let sy = 0;
        let sxx = 0;
        let sxy = 0;
        for (let j = from; j < to; j++) {
          if (masked[j]) continue;
          const u = j - i;
          k++;
          sx += u;
          sy += y[j]!;
          sxx += u * u;
          sxy += u * y[j]!;
        }
        const det = k * sxx - sx * sx;
        if (k >= 3 && det > 0) {
          knots.push(i);
          values.push((sy * sxx - sx * sxy) / det);
        }
      }
      if (i === n - 1) break;
    }
    if (knots.length === 0) break;
    level = interpolate(knots, values, n);
    const r = y.map((v, i) => sign * (v - level[i]!));
    noise = differenceNoise(r, masked);
    if (!(noise > 0)) break;
    // A line is a run of points, not one: the mean of three neighbours must stand 3σ/√3 out.
    // Clipping single points on one side would lift the median a little each round and let
    // the mask run away along a noisy continuum.
    const line = r.map((_, i) => {
      const lo = Math.max(0, i - 1);
      const hi = Math.min(n - 1, i + 1);
      let sum = 0;
      for (let j = lo; j <= hi; j++) sum += r[j]!;
      const k = hi - lo + 1;
      return sum / k > (CLIP_SIGMA * noise) / Math.sqrt(k);
    });
    // Grow the mask a little: a line's wings sit below the clip but still lift the median.
    const grow = Math.max(1, Math.floor(window / 16));
    const next = new Array<boolean>(n).fill(false);
    for (let i = 0; i < n; i++)
      if (line[i]) for (let j = Math.max(0, i - grow); j <= Math.min(n - 1, i + grow); j++) next[j] = true;
    if (next.every((m, i) => m === masked[i])) break;
    masked = next;
  }
  return { level, masked, noise };
}

function interpolate(knots: readonly number[], values: readonly number[], n: number): number[] {
  const out = new Array<number>(n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    while (k + 1 < knots.length - 1 && knots[k + 1]! < i) k++;
    if (knots.length === 1) out[i] = values[0]!;
    else {
      const k1 = Math.min(k + 1, knots.length - 1);
      const x0 = knots[k]!;
      const x1 = knots[k1]!;
      const t = x1 === x0 ? 0 : (i - x0) / (x1 - x0);
      out[i] =
        i <= knots[0]!
          ? values[0]!
          : i >= knots.at(-1)!
            ? values.at(-1)!
            : values[k]! + t * (values[k1]! - values[k]!);
    }
  }
  return out;
}
