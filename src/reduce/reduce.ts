/**
 * The reduce stage: raw readings → vacuum, rest-frame wavelengths with uncertainties.
 * Pure: a Session in, a Reduction (or diagnostics) out.
 */

import type { Diagnostic, Outcome } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import type { MeasurementMethod, Session } from '../session/types.js';
import { airToVacuum, vacuumPerAirSlope, vacuumToAir } from './airVacuum.js';
import { combineReadings } from './combine.js';
import { restFrame } from './doppler.js';
import { reduceGratingAngles } from './methods/gratingAngle.js';
import { reducePixels } from './methods/pixel.js';
import { reduceScreen } from './methods/screen.js';
import { reduceWavelengths } from './methods/wavelength.js';
import type { ProfileFinding } from './profile/find.js';
import { aboutFoundLines, linesFromProfile } from './profile/lines.js';
import { resolveKnownShift } from './shift.js';
import type { MeasuredLine, MethodResult, Reduction } from './types.js';

type MethodReducer = (session: Session) => MethodResult;

const REDUCERS: Partial<Record<MeasurementMethod, MethodReducer>> = {
  wavelength: reduceWavelengths,
  'grating-angle': reduceGratingAngles,
  screen: reduceScreen,
  pixel: reducePixels,
};

export function reduceSession(given: Session): Outcome<Reduction> {
  // A profile's lines are found first; from then on they are the session's lines.
  let session = given;
  let profile: ProfileFinding | null = null;
  const profileNotes: Diagnostic[] = [];
  if (given.profile) {
    const found = linesFromProfile(given, given.profile);
    if (found.diagnostics.some((d) => d.severity === 'error'))
      return { ok: false, diagnostics: found.diagnostics };
    session = found.session;
    profile = found.finding;
    profileNotes.push(...found.diagnostics);
  }
  const reducer = REDUCERS[session.measurement.method];
  if (!reducer) {
    return {
      ok: false,
      diagnostics: [
        {
          file: session.file,
          ...positionOfField(session, 'measurement.method'),
          severity: 'error',
          code: 'method-unsupported',
          field: 'measurement.method',
          message: `method ${session.measurement.method} cannot be reduced by this version`,
          hint: 'use method: wavelength',
        },
      ],
    };
  }
  const reduced = reducer(session);
  const result = profile ? { ...reduced, diagnostics: aboutFoundLines(reduced.diagnostics) } : reduced;
  const errors = result.diagnostics.filter((d) => d.severity === 'error');
  if (errors.length > 0) return { ok: false, diagnostics: result.diagnostics };
  const warnings: Diagnostic[] = [
    ...profileNotes,
    ...result.diagnostics.filter((d) => d.severity !== 'error'),
  ];

  const sameAs = new Map<number, number>();
  for (const line of session.lines) if (line.same_as !== null) sameAs.set(line.index, line.same_as);
  const combined = combineReadings(result.readings, sameAs);

  const shiftOutcome = resolveKnownShift(session);
  if (!shiftOutcome.ok) return { ok: false, diagnostics: shiftOutcome.diagnostics };
  const shift = shiftOutcome.value;
  warnings.push(...shiftOutcome.warnings);
  const z = shift?.z ?? 0;
  const zSigma = shift?.z_sigma ?? 0;

  const lines: MeasuredLine[] = combined.map((r) => {
    const raw = session.lines[r.index]!;
    const isAir = session.medium === 'air';
    const vacuum_nm = isAir ? airToVacuum(r.wavelength_nm) : r.wavelength_nm;
    const sigma_nm = isAir ? r.sigma_nm * vacuumPerAirSlope(r.wavelength_nm) : r.sigma_nm;
    const { rest_nm: rest_vacuum_nm, rest_sigma_nm } = restFrame(vacuum_nm, sigma_nm, z, zSigma);
    return {
      index: r.index,
      combined_indices: r.combined_indices,
      combined_spread_nm: r.combined_spread_nm,
      position: raw.position,
      vacuum_nm,
      air_nm: isAir ? r.wavelength_nm : vacuumToAir(r.wavelength_nm),
      sigma_nm,
      rest_vacuum_nm,
      rest_sigma_nm,
      intensity: raw.intensity,
      kind: raw.kind,
      width_nm: raw.width_nm,
      label: raw.label,
      reading_text: r.reading_text,
    };
  });

  return {
    ok: true,
    value: {
      session,
      medium: session.medium,
      lines,
      calibration: result.calibration,
      profile,
      shift,
      description: profile
        ? {
            ...result.description,
            text: `${result.description.text} The lines were found in the recorded profile ${given.profile?.file ?? ''} (below), not read by eye.`,
          }
        : result.description,
      resolution_nm: resolutionNm(session, lines),
      warnings,
    },
    warnings,
  };
}

/** FWHM in nm: given directly, or from the resolving power at the middle of the measured lines. */
function resolutionNm(session: Session, lines: MeasuredLine[]): number | null {
  if (session.instrument.resolution_nm !== null) return session.instrument.resolution_nm;
  const power = session.instrument.resolving_power;
  if (power === null || lines.length === 0) return null;
  const sorted = lines.map((l) => l.vacuum_nm).sort((a, b) => a - b);
  const middle = sorted[Math.floor(sorted.length / 2)]!;
  return middle / power;
}
