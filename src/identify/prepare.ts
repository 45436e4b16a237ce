/**
 * A species' reference lines inside the session's range, with lines closer than one
 * resolution element merged into blends (intensity-weighted centre, summed intensity) —
 * unless the measured lines show them resolved: two measured lines, one on each side of the
 * midpoint between two catalog lines and each within reach of its side, split the blend so that
 * each can be matched (a stated resolution can be too pessimistic; warnings.ts says so).
 */
import { lowerBound, windowRange } from '../lines/search.js';
import type { IntensityCondition, SpeciesLines } from '../lines/types.js';
import type { RefLine } from './types.js';

export interface ResolvedBy {
  /** Measured wavelengths, ascending, in the same frame as the catalog lines. */
  points: Float64Array;
  /** How far a measured line may sit from a catalog line and still stand for it. */
  halfWidth_nm: number;
}

/** Whether measured lines fall on both sides of the midpoint of catalog lines a < b, each near its own. */
function resolvedBetween(a: number, b: number, by: ResolvedBy): boolean {
  const mid = (a + b) / 2;
  const pts = by.points;
  const left = lowerBound(pts, a - by.halfWidth_nm);
  const hasLeft = left < pts.length && (pts[left] as number) < mid;
  const right = lowerBound(pts, mid);
  const hasRight = right < pts.length && (pts[right] as number) <= b + by.halfWidth_nm;
  return hasLeft && hasRight;
}

export function refsInRange(
  lines: SpeciesLines,
  from_nm: number,
  to_nm: number,
  fwhm_nm: number,
  resolvedBy: ResolvedBy | null = null,
): RefLine[] {
  const [start, end] = windowRange(lines.vacuum_nm, from_nm, to_nm);
  const out: RefLine[] = [];
  let group: number[] = [];
  const flush = () => {
    if (group.length === 0) return;
    let total = 0;
    let centre = 0;
    let unc = 0;
    const flags = new Set<string>();
    for (const k of group) {
      const w = lines.intensity[k] as number;
      total += w;
      centre += w * (lines.vacuum_nm[k] as number);
      unc = Math.max(unc, lines.unc_nm[k] as number);
      for (const f of lines.flags[k] ?? []) flags.add(f);
    }
    if (group.length > 1) flags.add('blend');
    const first = lines.vacuum_nm[group[0] as number] as number;
    const last = lines.vacuum_nm[group.at(-1) as number] as number;
    out.push({
      species: lines.species,
      vacuum_nm: total > 0 ? centre / total : (first + last) / 2,
      // A blend's centre is uncertain by its members' spread.
      unc_nm: Math.hypot(unc, (last - first) / 2),
      intensity: total,
      flags: [...flags].sort(),
      members: group.length,
    });
    group = [];
  };
  for (let k = start; k < end; k++) {
    const prev = group.at(-1);
    const here = lines.vacuum_nm[k] as number;
    const before = prev === undefined ? Number.NaN : (lines.vacuum_nm[prev] as number);
    // A blend spans at most one resolution element from its first line: lines each within
    // reach of the next would otherwise chain across several elements (six Fe II lines of
    // 500.3–502.0 nm at 1.5 nm merged into one "line" at 500.9, where no feature is).
    const first = group.length > 0 ? (lines.vacuum_nm[group[0] as number] as number) : Number.NaN;
    if (
      prev !== undefined &&
      (here - first >= fwhm_nm || (resolvedBy !== null && resolvedBetween(before, here, resolvedBy)))
    )
      flush();
    group.push(k);
  }
  flush();
  return out;
}

/**
 * The species' lines with the intensity column replaced by a condition's strengths
 * (data/lines/conditions.tsv), or the lines as they are when the condition is the lab's or
 * the table gives this species none. A line the table is silent on gets strength 0: the
 * tables list each species' strong lines under that condition, so an unlisted line is weaker
 * than every listed one (docs/catalog.md).
 */
export function conditionLines(lines: SpeciesLines, condition: IntensityCondition): SpeciesLines {
  if (condition === 'lab') return lines;
  const values = lines.strengths.get(condition);
  if (!values) return lines;
  return { ...lines, intensity: Float64Array.from(values, (v) => (Number.isFinite(v) ? v : 0)) };
}
