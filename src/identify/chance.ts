/**
 * Chance coincidence: how likely a species with this line density collects at least the
 * observed number of matches from the same number of lines scattered at random.
 * With n measured lines, each falling into the species' window union with probability f
 * (covered length / range length), the count is Binomial(n, f); the false-alarm
 * probability is P(X ≥ matched).
 */

export function binomialUpperTail(n: number, p: number, k: number): number {
  if (k <= 0) return 1;
  if (k > n) return 0;
  if (p <= 0) return 0;
  if (p >= 1) return 1;
  let total = 0;
  for (let i = k; i <= n; i++)
    total += Math.exp(logChoose(n, i) + i * Math.log(p) + (n - i) * Math.log1p(-p));
  return Math.min(1, total);
}

function logChoose(n: number, k: number): number {
  return logFactorial(n) - logFactorial(k) - logFactorial(n - k);
}

const FACTORIAL_CACHE: number[] = [0];
function logFactorial(n: number): number {
  for (let i = FACTORIAL_CACHE.length; i <= n; i++)
    FACTORIAL_CACHE[i] = (FACTORIAL_CACHE[i - 1] as number) + Math.log(i);
  return FACTORIAL_CACHE[n] as number;
}

/** Length of the union of intervals [c − h, c + h] clipped to [lo, hi]; centres sorted ascending. */
export function coveredLength(centres: readonly number[], halfWidth: number, lo: number, hi: number): number {
  let total = 0;
  let runStart = Number.NEGATIVE_INFINITY;
  let runEnd = Number.NEGATIVE_INFINITY;
  for (const c of centres) {
    const a = Math.max(lo, c - halfWidth);
    const b = Math.min(hi, c + halfWidth);
    if (b <= a) continue;
    if (a > runEnd) {
      if (runEnd > runStart) total += runEnd - runStart;
      runStart = a;
      runEnd = b;
    } else {
      runEnd = Math.max(runEnd, b);
    }
  }
  if (runEnd > runStart) total += runEnd - runStart;
  return total;
}
