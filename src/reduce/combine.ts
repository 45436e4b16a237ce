/**
 * Several readings of one line (orders 1 and 2, or both sides ±m, linked with `same_as`) are
 * combined by an inverse-variance weighted mean; the spread between them is kept for the record.
 */
import type { ObservedReading } from './types.js';

export interface CombinedReading extends ObservedReading {
  combined_indices: number[];
  combined_spread_nm: number;
}

/** Union–find over `same_as` links; the group is reported under its smallest line index. */
export function combineReadings(
  readings: ObservedReading[],
  sameAs: ReadonlyMap<number, number>,
): CombinedReading[] {
  const parent = new Map<number, number>(readings.map((r) => [r.index, r.index]));
  const find = (i: number): number => {
    let root = i;
    while (parent.get(root) !== root) root = parent.get(root) ?? root;
    return root;
  };
  for (const [a, b] of sameAs) {
    if (!parent.has(a) || !parent.has(b)) continue;
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent.set(Math.max(ra, rb), Math.min(ra, rb));
  }
  const groups = new Map<number, ObservedReading[]>();
  for (const r of readings) {
    const root = find(r.index);
    const list = groups.get(root) ?? [];
    list.push(r);
    groups.set(root, list);
  }
  const out: CombinedReading[] = [];
  for (const [root, members] of groups) {
    if (members.length === 1) {
      const only = members[0]!;
      out.push({ ...only, combined_indices: [], combined_spread_nm: 0 });
      continue;
    }
    out.push(weightedMean(root, members));
  }
  return out.sort((a, b) => a.index - b.index);
}

function weightedMean(root: number, members: ObservedReading[]): CombinedReading {
  // A zero sigma would get infinite weight; floor it at a tiny value so the mean stays defined.
  const weights = members.map((m) => 1 / Math.max(m.sigma_nm, 1e-6) ** 2);
  const total = weights.reduce((a, b) => a + b, 0);
  const mean = members.reduce((acc, m, i) => acc + m.wavelength_nm * weights[i]!, 0) / total;
  const values = members.map((m) => m.wavelength_nm);
  const first = members.find((m) => m.index === root) ?? members[0]!;
  return {
    index: root,
    wavelength_nm: mean,
    sigma_nm: Math.sqrt(1 / total),
    reading_text: members.map((m) => m.reading_text).join('; '),
    combined_indices: members.map((m) => m.index).filter((i) => i !== first.index),
    combined_spread_nm: Math.max(...values) - Math.min(...values),
  };
}
