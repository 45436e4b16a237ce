/**
 * Plain words for the record pages: what a score means, which sources have a velocity worth
 * showing, how a shift is described, and how a problem is told to a reader (no codes).
 */
import type { Diagnostic } from '../diagnostics.js';
import type { ShiftFound } from '../identify/types.js';
import type { AppliedShift } from '../reduce/types.js';
import type { SourceKind } from '../session/types.js';
import { fixed } from './format.js';

/**
 * A log-likelihood ratio (natural log of a Bayes factor) in words, on the scale of Kass and
 * Raftery (1995), "Bayes Factors", J. Am. Stat. Assoc. 90, 773–795, Table in §3.2 (from memory):
 * 2·ln B of 0–2 "not worth more than a bare mention", 2–6 "positive", 6–10 "strong",
 * above 10 "very strong" — here halved, since the score is ln B.
 */
export function evidenceWords(score_nats: number): string {
  if (!Number.isFinite(score_nats) || score_nats <= 0) return 'none';
  if (score_nats < 1) return 'barely any';
  if (score_nats < 3) return 'some';
  if (score_nats < 5) return 'strong';
  return 'very strong';
}

/** The scale itself, for captions (same thresholds as evidenceWords). */
export const EVIDENCE_SCALE =
  'none (0 or less), barely any (below 1), some (1–3), strong (3–5), very strong (above 5)';

/** Sources whose line-of-sight velocity is a result in itself; elsewhere km/s means nothing. */
export function velocityMatters(kind: SourceKind): boolean {
  return kind === 'star' || kind === 'galaxy' || kind === 'nebula';
}

/** Whether a source's shift is read as a redshift (galaxies) rather than a velocity. */
function isRedshift(mode: 'redshift' | 'velocity' | 'search', kind: SourceKind): boolean {
  return mode === 'redshift' || (mode === 'search' && kind === 'galaxy');
}

/** "Redshift removed" or "Radial velocity removed": the heading of the shift paragraph. */
export function shiftHeading(
  shift: { mode: 'redshift' | 'velocity' } | AppliedShift,
  kind: SourceKind,
): string {
  const mode = 'mode' in shift ? shift.mode : shift.source;
  return isRedshift(mode, kind) ? 'Redshift removed.' : 'Line-of-sight velocity removed.';
}

function plusMinus(sigma: number, digits: number, unit = ''): string {
  return sigma > 0 ? ` ± ${fixed(sigma, digits)}${unit}` : '';
}

/** Significant digits enough to show a small z without a wall of zeros. */
function zText(z: number, sigma: number): string {
  const digits = sigma > 0 ? Math.max(1, Math.min(8, 1 - Math.floor(Math.log10(sigma)))) : 5;
  return `${fixed(z, digits)}${plusMinus(sigma, digits)}`;
}

const BARY_WORDS =
  'the Earth’s own motion towards the source, removed so the velocity refers to the centre of mass of the Solar System';

export function knownShiftText(s: AppliedShift, kind: SourceKind): string {
  const given = s.z_sigma > 0 || s.velocity_sigma_km_s > 0 ? '' : ' (as given, no uncertainty stated)';
  const bary = s.barycentric
    ? ` It includes a correction of ${fixed(s.barycentric.correction_km_s, 2)} km/s for ${BARY_WORDS}.`
    : '';
  if (s.source === 'redshift' || kind === 'galaxy')
    return `Redshift z = ${zText(s.z, s.z_sigma)} from the session${given}; wavelengths were divided by 1 + z.${bary}`;
  return `v = ${fixed(s.velocity_km_s, 2)}${plusMinus(s.velocity_sigma_km_s, 2, ' km/s')} km/s from the session${given}.${bary}`;
}

export function foundShiftText(f: ShiftFound, kind: SourceKind): string {
  const what = isRedshift(f.mode, kind)
    ? `z = ${zText(f.z, f.z_sigma)}`
    : `v = ${fixed(f.velocity_km_s, 1)} ± ${fixed(f.velocity_sigma_km_s, 1)} km/s`;
  const bary =
    f.barycentric_velocity_km_s !== null
      ? ` With the correction for ${BARY_WORDS}, v = ${fixed(f.barycentric_velocity_km_s, 1)} km/s.`
      : '';
  const warning = f.warning ? ` Note: ${f.warning}.` : '';
  return `Found by trying shifts across the session's range: ${what}, from ${f.lines_used} matched lines.${bary}${warning}`;
}

/**
 * Advice that fits the source: a laser gives one line and a flame test a few, so "measure
 * more lines" is advice those sessions cannot follow.
 */
function adviceFor(d: Diagnostic, kind: SourceKind | null): string | undefined {
  if (d.code !== 'few-lines') return d.hint;
  if (kind === 'laser')
    return 'a laser gives a single line, so this is expected: compare it with the wavelength the laser is rated for';
  if (kind === 'flame')
    return 'a flame test shows only a few lines: repeat it with a known salt of the same metal beside it to confirm';
  return d.hint;
}

/** A problem told to a reader of the page: where in the session file, what, what to do. */
export function plainProblem(d: Diagnostic, kind: SourceKind | null = null): string {
  const advice = adviceFor(d, kind);
  const where = d.line > 0 ? `Line ${d.line} of the session file: ` : '';
  const message = d.message.charAt(0).toUpperCase() + d.message.slice(1);
  const hint = advice ? ` ${advice.charAt(0).toUpperCase()}${advice.slice(1)}` : '';
  const end = (s: string) => (/[.!?]$/.test(s) ? s : `${s}.`);
  return `${where}${end(message)}${hint ? end(hint) : ''}`;
}
