/**
 * Which origin (read, memory, computed) the catalog rows behind one assigned reference line
 * have. Identification merges rows closer than a resolution element into one reference line
 * (src/identify/prepare.ts), so a blend's origin is that of every row within one FWHM of its
 * centre; a single line's is its nearest row's. Pure.
 */
import { windowRange } from './search.js';
import type { Catalog, LineOrigin, SpeciesLines } from './types.js';

/** One origin, or `mixed` when a blend's rows disagree; null if the species has no rows. */
export type ReferenceOrigin = LineOrigin | 'mixed';

export function referenceOrigin(
  catalog: Catalog,
  species: string,
  ref_vacuum_nm: number,
  blend: boolean,
  fwhm_nm: number,
): ReferenceOrigin | null {
  // The weighed lines and the faint ones (an assignment can be to either).
  const tables = [catalog.species.get(species), catalog.faint.get(species)].filter(
    (l): l is SpeciesLines => l !== undefined && l.vacuum_nm.length > 0,
  );
  if (tables.length === 0) return null;
  if (blend) {
    const found = new Set<LineOrigin>();
    for (const lines of tables) {
      const [a, b] = windowRange(lines.vacuum_nm, ref_vacuum_nm - fwhm_nm, ref_vacuum_nm + fwhm_nm);
      for (const o of lines.origin.slice(a, b)) found.add(o);
    }
    if (found.size === 1) return [...found][0] as LineOrigin;
    if (found.size > 1) return 'mixed';
  }
  let best: { origin: LineOrigin; distance: number } | null = null;
  for (const lines of tables)
    for (let k = 0; k < lines.vacuum_nm.length; k++) {
      const distance = Math.abs((lines.vacuum_nm[k] as number) - ref_vacuum_nm);
      if (best === null || distance < best.distance)
        best = { origin: lines.origin[k] as LineOrigin, distance };
    }
  return best?.origin ?? null;
}

/** How many of the assigned reference lines were read, recalled, computed (or mixed blends). */
export function countOrigins(origins: readonly (ReferenceOrigin | null)[]): Record<ReferenceOrigin, number> {
  const out: Record<ReferenceOrigin, number> = { read: 0, memory: 0, computed: 0, mixed: 0 };
  for (const o of origins) if (o !== null) out[o]++;
  return out;
}
