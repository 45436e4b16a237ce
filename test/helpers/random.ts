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
