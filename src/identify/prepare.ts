/**
 * A species' reference lines inside the session's range, with lines closer than one
 * resolution element merged into blends (intensity-weighted centre, summed intensity).
 */
import { windowRange } from '../lines/search.js';
import type { SpeciesLines } from '../lines/types.js';
import type { RefLine } from './types.js';

export function refsInRange(lines: SpeciesLines, from_nm: number, to_nm: number, fwhm_nm: number): RefLine[] {
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
    if (prev !== undefined && (lines.vacuum_nm[k] as number) - (lines.vacuum_nm[prev] as number) >= fwhm_nm)
      flush();
    group.push(k);
  }
  flush();
  return out;
}
