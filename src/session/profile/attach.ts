/**
 * The read stage's step for a session with `profile:`: the bytes the edge read (or its reason
 * for not reading them) become the session's checked profile, every problem placed at the
 * session's `profile.file` field. Pure.
 */

import { createHash } from 'node:crypto';
import { NM_PER_ANGSTROM, NM_PER_MICROMETRE } from '../../constants.js';
import type { Diagnostic } from '../../diagnostics.js';
import type { ProfileDocument, SessionDocument } from '../schema.js';
import type { Session, WavelengthUnit } from '../types.js';
import { defaultLineKind } from '../vocabulary.js';
import type { YamlSource } from '../yamlSource.js';
import { readProfileBytes } from './read.js';
import type { ProfileInput, ProfileProblem } from './types.js';

/** Default detection threshold, in noise σ: 5σ keeps chance peaks rare in a few thousand points (common practice). */
export const DEFAULT_PROFILE_THRESHOLD = 5;

const NM_PER: Record<WavelengthUnit, number> = { nm: 1, angstrom: NM_PER_ANGSTROM, um: NM_PER_MICROMETRE };

export function attachProfile(
  session: Session,
  doc: SessionDocument & { profile: ProfileDocument },
  source: YamlSource,
  input: ProfileInput | null | undefined,
): { session: Session | null; diagnostics: Diagnostic[] } {
  const at = source.positionOf(['profile', 'file']);
  const place = (p: ProfileProblem, severity: Diagnostic['severity']): Diagnostic => ({
    file: session.file,
    ...at,
    severity,
    code: p.code,
    field: 'profile.file',
    message: p.message,
    hint: p.hint,
  });
  const spec = doc.profile;
  if (!input || input.name !== spec.file)
    return {
      session: null,
      diagnostics: [
        place(
          {
            code: 'profile-not-read',
            message: `the profile ${spec.file} was not read by this command`,
            hint: 'build, vet and identify read it: check the file name',
          },
          'error',
        ),
      ],
    };
  if ('problem' in input) return { session: null, diagnostics: [place(input.problem, 'error')] };
  const axis = session.measurement.method === 'pixel' ? 'pixel' : 'wavelength';
  const checked = readProfileBytes(input.bytes, spec.file, {
    axis,
    nmPerUnit: NM_PER[session.measurement.unit],
  });
  const diagnostics = [
    ...checked.problems.map((p) => place(p, 'error')),
    ...checked.warnings.map((p) => place(p, 'warning')),
  ];
  const data = checked.profile;
  if (!data) return { session: null, diagnostics };
  if (data.axis !== axis) {
    diagnostics.push(
      place(
        {
          code: 'profile-axis',
          message: `${spec.file} has a ${data.axis} axis, but the session's method is ${session.measurement.method}`,
          hint: data.axis === 'pixel' ? 'use method: pixel with a calibration' : 'use method: wavelength',
        },
        'error',
      ),
    );
    return { session: null, diagnostics };
  }
  let medium = session.medium;
  if (data.medium !== null) {
    if (doc.medium !== undefined && doc.medium !== data.medium) {
      diagnostics.push({
        ...place(
          {
            code: 'profile-medium',
            message: `${spec.file} gives ${data.medium} wavelengths (CTYPE1), but the session says medium: ${doc.medium}`,
            hint: `remove medium: (the file says it) or write medium: ${data.medium}`,
          },
          'error',
        ),
        ...source.positionOf(['medium']),
        field: 'medium',
      });
      return { session: null, diagnostics };
    }
    medium = data.medium;
  }
  return {
    session: {
      ...session,
      medium,
      profile: {
        file: spec.file,
        sha256: createHash('sha256').update(input.bytes).digest('hex'),
        data,
        kind: spec.kind ?? defaultLineKind(session.source.kind, session.source.class),
        threshold_sigma: spec.threshold ?? DEFAULT_PROFILE_THRESHOLD,
        add: spec.add ?? [],
        drop: spec.drop ?? [],
        edit: (spec.edit ?? []).map((e, i) => ({
          at: e.at,
          label: e.label ?? null,
          sigma: e.sigma ?? null,
          position: source.positionOf(['profile', 'edit', i]),
        })),
        position: source.positionOf(['profile']),
      },
    },
    diagnostics,
  };
}
