import { distance } from 'fastest-levenshtein';

/** The closest known word to a misspelt one, when it is close enough to be a plausible slip. */
export function didYouMean(word: string, known: readonly string[]): string | null {
  let best: string | null = null;
  let bestDistance = Number.POSITIVE_INFINITY;
  const lower = word.toLowerCase();
  for (const candidate of known) {
    const d = distance(lower, candidate.toLowerCase());
    if (d < bestDistance) {
      bestDistance = d;
      best = candidate;
    }
  }
  const allowed = Math.max(2, Math.floor(word.length / 3));
  return best !== null && bestDistance <= allowed ? best : null;
}
