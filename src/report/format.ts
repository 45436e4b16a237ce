/** Number and text formatting shared by the pages. */
import { vacuumToAir } from '../reduce/airVacuum.js';
import type { Medium } from '../session/types.js';

export function fixed(x: number | null | undefined, digits: number): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const s = x.toFixed(digits);
  return s === `-${(0).toFixed(digits)}` ? (0).toFixed(digits) : s;
}

export { percent } from '../identify/summary.js';

export function probability(p: number): string {
  if (p < 1e-4) return '< 0.0001';
  return p.toFixed(4);
}

/** A rest-frame vacuum wavelength shown in the session's medium. */
export function display(vacuum_nm: number, medium: Medium): number {
  return medium === 'air' ? vacuumToAir(vacuum_nm) : vacuum_nm;
}

/** Forbidden lines are written in brackets: [O III]. */
export function speciesLabel(species: string, flags: readonly string[] = []): string {
  if (flags.includes('forbidden')) return `[${species}]`;
  if (flags.includes('semiforbidden')) return `${species}]`;
  return species;
}
