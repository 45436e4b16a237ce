/**
 * Which origin (read, memory, computed) the catalog rows behind one assigned reference line
 * have. Identification merges rows closer than a resolution element into one reference line
 * (src/identify/prepare.ts), so a blend's origin is that of every row within one FWHM of its
 * centre; a single line's is its nearest row's. Pure.
 */
import { windowRange } from './search.js';
import type { Catalog, LineOrigin } from './types.js';

/** One origin, or `mixed` when a blend's rows disagree; null if the species has no rows. */
export type ReferenceOrigin = LineOrigin | 'mixed';

export function referenceOrigin(
  catalog: Catalog,
  species: string,
  ref_vacuum_nm: number,
  blend: boolean,
  fwhm_nm: number,
): ReferenceOrigin | null {
  const lines = catalog.species.get(species);
  if (!lines || lines.vacuum_nm.length === 0) return null;
  if (blend) {
    const [a, b] = windowRange(lines.vacuum_nm, ref_vacuum_nm - fwhm_nm, ref_vacuum_nm + fwhm_nm);
    const found = new Set(lines.origin.slice(a, b));
    if (found.size === 1) return [...found][0] as LineOrigin;
    if (found.size > 1) return 'mixed';
  }
  let best = 0;
  for (let k = 1; k < lines.vacuum_nm.length; k++)
    if (
      Math.abs((lines.vacuum_nm[k] as number) - ref_vacuum_nm) <
      Math.abs((lines.vacuum_nm[best] as number) - ref_vacuum_nm)
    )
      best = k;
  return lines.origin[best] as LineOrigin;
}

/** How many of the assigned reference lines were read, recalled, computed (or mixed blends). */
export function countOrigins(origins: readonly (ReferenceOrigin | null)[]): Record<ReferenceOrigin, number> {
  const out: Record<ReferenceOrigin, number> = { read: 0, memory: 0, computed: 0, mixed: 0 };
  for (const o of origins) if (o !== null) out[o]++;
  return out;
}
