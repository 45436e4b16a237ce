/** Binary search over sorted Float64Arrays: window look-ups in O(log n), never a scan. */

/** First index i with values[i] >= x (values.length if none). */
export function lowerBound(values: Float64Array, x: number): number {
  let lo = 0;
  let hi = values.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if ((values[mid] as number) < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Half-open index range [start, end) of values inside [from, to]. */
export function windowRange(values: Float64Array, from: number, to: number): [number, number] {
  const start = lowerBound(values, from);
  let end = lowerBound(values, to);
  while (end < values.length && (values[end] as number) <= to) end++;
  return [start, end];
}
