/**
 * The index's small strip of a session's lines: one coloured tick per line on a common
 * wavelength scale, so sessions can be compared at a glance. Hand-written SVG (a few ticks do
 * not need a chart library), deterministic, with a text alternative.
 */
import { SPECIES_PALETTE } from './colour.js';

/** The visible range every strip shares (nm), so ticks line up from row to row. */
export const STRIP_RANGE_NM: [number, number] = [380, 720];
const WIDTH = 240;
const HEIGHT = 22;
const UNEXPLAINED = '#777777';

export interface StripLine {
  /** Rest-frame wavelength in the session's medium. */
  nm: number;
  species: string | null;
}

/** Colours by species across the whole archive: the most often found species first. */
export function speciesColours(lists: readonly (readonly StripLine[])[]): Map<string, string> {
  const count = new Map<string, number>();
  for (const lines of lists)
    for (const s of new Set(lines.map((l) => l.species)))
      if (s !== null) count.set(s, (count.get(s) ?? 0) + 1);
  const order = [...count.entries()].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]));
  return new Map(order.map(([s], i) => [s, SPECIES_PALETTE[i % SPECIES_PALETTE.length] as string]));
}

function escapeXml(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

export function stripSvg(lines: readonly StripLine[], colours: ReadonlyMap<string, string>): string {
  const [lo, hi] = STRIP_RANGE_NM;
  const x = (nm: number) => ((Math.min(hi, Math.max(lo, nm)) - lo) / (hi - lo)) * (WIDTH - 2) + 1;
  const ticks = [...lines]
    .sort((a, b) => a.nm - b.nm)
    .map((l) => {
      const colour = l.species ? (colours.get(l.species) ?? UNEXPLAINED) : UNEXPLAINED;
      const dash = l.species ? '' : ' stroke-dasharray="3 2"';
      return `<line x1="${x(l.nm).toFixed(1)}" x2="${x(l.nm).toFixed(1)}" y1="2" y2="${HEIGHT - 2}" stroke="${colour}" stroke-width="2.5"${dash}/>`;
    })
    .join('');
  const described = [...lines]
    .sort((a, b) => a.nm - b.nm)
    .map((l) => `${l.nm.toFixed(1)} nm ${l.species ?? 'unexplained'}`)
    .join(', ');
  const label = `Lines from ${lo} to ${hi} nm: ${described || 'none'}`;
  return `<svg class="strip" role="img" aria-label="${escapeXml(label)}" viewBox="0 0 ${WIDTH} ${HEIGHT}" width="${WIDTH}" height="${HEIGHT}"><rect x="0.5" y="0.5" width="${WIDTH - 1}" height="${HEIGHT - 1}" fill="#f7f7f7" stroke="#cccccc"/>${ticks}</svg>`;
}

/** A small colour square for the strip's key (SVG, not an inline style: the pages' CSP may forbid those). */
export function swatchSvg(colour: string | null): string {
  const fill = colour ?? UNEXPLAINED;
  return `<svg class="swatch" aria-hidden="true" viewBox="0 0 10 10" width="10" height="10"><rect width="10" height="10" fill="${escapeXml(fill)}"/></svg>`;
}
