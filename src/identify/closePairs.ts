/**
 * Measured lines closer together than the instrument's stated resolution. An instrument cannot
 * separate two lines much closer than one resolution element (FWHM; the Rayleigh criterion puts
 * the limit at about one FWHM for Gaussian profiles, common practice), so such a pair means that
 * the stated resolution is too pessimistic, or that one line was listed twice. Either way the
 * reader should know: the identification weighs the two as separate lines.
 */
import type { MeasuredLine } from '../reduce/types.js';

export interface ClosePair {
  first: MeasuredLine;
  second: MeasuredLine;
  separation_nm: number;
}

/** Neighbouring lines (by observed wavelength) closer than resolution_nm, in wavelength order. */
export function closePairs(lines: readonly MeasuredLine[], resolution_nm: number | null): ClosePair[] {
  if (resolution_nm === null || !(resolution_nm > 0)) return [];
  const sorted = [...lines].sort((a, b) => a.vacuum_nm - b.vacuum_nm);
  const out: ClosePair[] = [];
  for (let i = 1; i < sorted.length; i++) {
    const first = sorted[i - 1] as MeasuredLine;
    const second = sorted[i] as MeasuredLine;
    // Absorption beside emission is not a pair a spectrometer had to resolve as two peaks.
    if (first.kind !== second.kind) continue;
    const separation_nm = second.vacuum_nm - first.vacuum_nm;
    if (separation_nm < resolution_nm) out.push({ first, second, separation_nm });
  }
  return out;
}

/** The warning's text: the closest pairs named by their readings, the rest counted. */
export function describeClosePairs(pairs: readonly ClosePair[], resolution_nm: number): string {
  const shown = pairs
    .slice(0, 3)
    .map(
      (p) =>
        `lines[${p.first.index}] and lines[${p.second.index}] (${p.first.reading_text}, ${p.second.reading_text}) are ${p.separation_nm.toFixed(2)} nm apart`,
    );
  const more =
    pairs.length > 3 ? `, and ${pairs.length - 3} more pair${pairs.length - 3 === 1 ? '' : 's'}` : '';
  return `${shown.join('; ')}${more}: closer than the stated resolution of ${resolution_nm.toFixed(2)} nm, so the instrument could not have separated them`;
}
