/**
 * Spectroscopic notation: a species seen only in forbidden lines is written [O III], one seen in
 * semi-forbidden (intercombination) lines C III] (the IAU/astronomical convention, common practice).
 * Decided from the catalog flags of the lines that stand for the species in a session.
 */

/** Display name of `species` from the flags of its lines (those assigned, else those in range). */
export function displayName(species: string, lineFlags: readonly (readonly string[])[]): string {
  if (lineFlags.length === 0) return species;
  const forbiddenOrSemi = lineFlags.every((f) => f.includes('forbidden') || f.includes('semiforbidden'));
  if (!forbiddenOrSemi) return species;
  // A blend of a forbidden and a semi-forbidden line (C III] 190.9) is written semi-forbidden.
  if (lineFlags.some((f) => f.includes('semiforbidden'))) return `${species}]`;
  return `[${species}]`;
}
