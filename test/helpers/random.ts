/**
 * Seeded randomness shared by the tests, the benchmarks and the archive generator, so every
 * Monte-Carlo check and synthetic session is reproducible.
 */

/** mulberry32: a small, well-mixed 32-bit PRNG; uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** One standard normal deviate by the Box–Muller transform. */
export function gaussianDeviate(uniform: () => number): number {
  const u = 1 - uniform(); // (0, 1]: log(0) would be −∞
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * uniform());
}

/** A generator of standard normal deviates. */
export function gaussian(uniform: () => number): () => number {
  return () => gaussianDeviate(uniform);
}

/**
 * One Poisson deviate of the given mean: Knuth's multiplication method below 30 (Knuth, TAOCP
 * vol. 2, §3.4.1), the normal approximation rounded to an integer above (its variance is the
 * mean to well under 1 % there; common practice).
 */
export function poissonDeviate(uniform: () => number, mean: number): number {
  if (!(mean > 0)) return 0;
  if (mean < 30) {
    const limit = Math.exp(-mean);
    let k = 0;
    let p = uniform();
    while (p > limit) {
      k++;
      p *= uniform();
    }
    return k;
  }
  return Math.max(0, Math.round(mean + Math.sqrt(mean) * gaussianDeviate(uniform)));
}
