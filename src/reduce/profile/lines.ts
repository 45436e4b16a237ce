/**
 * A session's profile → its lines: the finder's lines become raw readings of the session's
 * method (pixel positions for a camera profile, wavelengths in measurement.unit otherwise),
 * so they take the same path through calibration and identification as typed lines.
 */
import type { Diagnostic } from '../../diagnostics.js';
import type { RawLine, Session, SessionProfile } from '../../session/types.js';
import { NM_PER_UNIT } from '../methods/wavelength.js';
import { type FoundLine, findLines, type ProfileFinding } from './find.js';

/** Axis values of the session (px, or measurement.unit) → the profile's (px, or nm). */
function toAxis(session: Session, v: number): number {
  return session.measurement.method === 'pixel' ? v : v * NM_PER_UNIT[session.measurement.unit];
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/**
 * Decimals that keep a reading one digit beyond its σ's first significant digit: the rounding
 * error (at most a twentieth of σ) is lost in σ, and the record shows no false precision.
 */
function decimalsFor(sigma: number): number {
  if (!(sigma > 0) || !Number.isFinite(sigma)) return 6;
  return Math.min(6, Math.max(0, Math.ceil(-Math.log10(sigma)) + 1));
}

function rawLine(session: Session, profile: SessionProfile, l: FoundLine, index: number): RawLine {
  const pixel = session.measurement.method === 'pixel';
  const perUnit = NM_PER_UNIT[session.measurement.unit];
  return {
    index,
    position: profile.position,
    // Rounded below their σ, so the record's readings stay legible.
    wavelength: pixel ? null : round(l.centre / perUnit, decimalsFor(l.centre_sigma / perUnit)),
    angle_deg: null,
    angle_left_deg: null,
    angle_right_deg: null,
    offset_mm: null,
    separation_mm: null,
    pixel: pixel ? round(l.centre, decimalsFor(l.centre_sigma)) : null,
    sigma: pixel ? l.centre_sigma : l.centre_sigma / perUnit,
    order: null,
    same_as: null,
    // Relative area (emission) or depth (absorption) in percent: a number on the 0–∞ scale.
    intensity: round(100 * l.relative, 1),
    kind: profile.kind,
    width_nm: pixel ? null : l.fwhm,
    label: l.origin === 'added' ? 'added in profile.add' : null,
  };
}

/**
 * A method's diagnostics about `lines[i]` of a profile session are about found line i + 1:
 * say so (the session has no lines: to point at) and round the long fitted numbers they quote.
 */
export function aboutFoundLines(diagnostics: readonly Diagnostic[]): Diagnostic[] {
  return diagnostics.map((d) => {
    const m = /^lines\[(\d+)\]/.exec(d.field);
    if (!m) return d;
    const message = d.message.replace(/-?\d+\.\d{4,}/g, (v) => Number(v).toFixed(2));
    return { ...d, field: 'profile', message: `found line ${Number(m[1]) + 1}: ${message}` };
  });
}

export interface ProfileLines {
  session: Session;
  finding: ProfileFinding;
  diagnostics: Diagnostic[];
}

export function linesFromProfile(session: Session, profile: SessionProfile): ProfileLines {
  const finding = findLines(profile.data, {
    kind: profile.kind,
    threshold_sigma: profile.threshold_sigma,
    add: profile.add.map((v) => toAxis(session, v)),
    drop: profile.drop.map((v) => toAxis(session, v)),
  });
  const at = { file: session.file, ...profile.position };
  const diagnostics: Diagnostic[] = [];
  const unit = session.measurement.method === 'pixel' ? 'px' : session.measurement.unit;
  for (const d of finding.unmatched_drops) {
    const shown = session.measurement.method === 'pixel' ? d : d / NM_PER_UNIT[session.measurement.unit];
    diagnostics.push({
      ...at,
      severity: 'warning',
      code: 'profile-drop-unmatched',
      field: 'profile.drop',
      message: `no found line lies within its FWHM of ${shown} ${unit}; nothing was dropped there`,
      hint: 'check the position against the lines the record lists, or remove it from drop:',
    });
  }
  if (finding.lines.length === 0)
    diagnostics.push({
      ...at,
      severity: 'error',
      code: 'profile-no-lines',
      field: 'profile',
      message: `no ${profile.kind} line stands ${profile.threshold_sigma}σ above the noise of ${profile.file}`,
      hint: `check kind: (emission or absorption), lower threshold:, or name the lines under add:`,
    });
  const lines = finding.lines.map((l, i) => rawLine(session, profile, l, i));
  // profile.edit: the found line nearest each position, within its FWHM (the rule drop: uses).
  for (const e of profile.edit) {
    const x = toAxis(session, e.at);
    let best = -1;
    finding.lines.forEach((l, k) => {
      if (best < 0 || Math.abs(l.centre - x) < Math.abs((finding.lines[best] as FoundLine).centre - x))
        best = k;
    });
    const hit = best >= 0 ? (finding.lines[best] as FoundLine) : null;
    if (!hit || Math.abs(hit.centre - x) > hit.fwhm) {
      diagnostics.push({
        file: session.file,
        ...e.position,
        severity: 'warning',
        code: 'profile-edit-unmatched',
        field: 'profile.edit',
        message: `no found line lies within its FWHM of ${e.at} ${unit}; this edit changes nothing`,
        hint: 'check the position against the lines the record lists, or remove the edit',
      });
      continue;
    }
    const line = lines[best] as RawLine;
    lines[best] = { ...line, label: e.label ?? line.label, sigma: e.sigma ?? line.sigma };
  }
  return { session: { ...session, lines }, finding, diagnostics };
}
