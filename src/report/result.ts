/**
 * The machine-readable result (DESIGN.md's contract), stored as result.json beside each record
 * and printed by `lineledger identify --json`. Field names are the contract: do not rename.
 */

import type { Identification } from '../identify/types.js';
import { countOrigins, type ReferenceOrigin, referenceOrigin } from '../lines/origin.js';
import { FAINT_FLAG } from '../lines/parse.js';
import type { Catalog } from '../lines/types.js';
import type { FoundLine } from '../reduce/profile/find.js';
import type { CalibrationResult, Reduction } from '../reduce/types.js';

export interface ResultJson {
  format: 'lineledger-result/1';
  id: string;
  program: { name: 'lineledger'; version: string };
  catalog: { version: string; sha256: string };
  /** How many of the assigned lines' reference values were read, recalled (memory), computed. */
  reference_origins: Record<ReferenceOrigin, number>;
  input: { file: string; sha256: string };
  medium: 'air' | 'vacuum';
  status: string;
  summary: string;
  lines: {
    index: number;
    label: string | null;
    reading: string;
    vacuum_nm: number;
    air_nm: number;
    sigma_nm: number;
    rest_vacuum_nm: number;
    rest_sigma_nm: number;
    intensity: number | null;
    kind: string;
    combined_with: number[];
    /** identified, tentative (best plausible assignment, species not confirmed) or unexplained. */
    status: string;
    /** Probability that the assignment is right (0 when unexplained). */
    probability: number;
    assignment: {
      species: string;
      /** In spectroscopic notation: [O III], C III]. */
      display: string;
      ref_vacuum_nm: number;
      residual_nm: number;
      residual_km_s: number;
      blend: boolean;
      /** A faint catalog line: it names a line left over, never evidence (docs/identification.md). */
      faint: boolean;
      /** Where the reference value comes from: read from its source, recalled, or computed. */
      ref_origin: ReferenceOrigin | null;
    } | null;
    alternatives: { species: string; ref_vacuum_nm: number; residual_nm: number }[];
  }[];
  candidates: {
    species: string;
    display: string;
    score: number;
    confidence: number;
    matched: number;
    expected: number;
    false_alarm: number;
    rank_correlation: number | null;
    rms_residual_nm: number | null;
    missing_nm: number[];
  }[];
  explanation: {
    species: string[];
    /** The explanation's species in spectroscopic notation, in the same order. */
    display: string[];
    /** Species that explain lines only tentatively, named apart from the confirmed ones. */
    tentative: string[];
    unexplained: number[];
    confidence: number;
    status: string;
    contenders: { species: string[]; probability: number }[];
    discriminators: { species: string; vacuum_nm: number; air_nm: number; against: string }[];
  };
  shift: {
    source: string;
    z: number;
    z_sigma: number;
    velocity_km_s: number;
    velocity_sigma_km_s: number;
    barycentric: unknown;
    /** Only for a searched shift. */
    search?: {
      mode: string;
      lines_used: number;
      step_z: number;
      barycentric_velocity_km_s: number | null;
      runner_up: { z: number; velocity_km_s: number; score: number } | null;
      warning: string | null;
      scan: { z: number; velocity_km_s: number; score: number }[];
    };
  } | null;
  calibration: CalibrationResult | null;
  /** The recorded profile the lines were found in, and what the finder did (null: lines were typed). */
  profile: {
    file: string;
    /** Hex SHA-256 of the profile file, beside input.sha256 of the session. */
    sha256: string;
    format: string;
    axis: string;
    points: number;
    kind: string;
    threshold_sigma: number;
    /** Noise of one point and the detection level: intensity units, or fractions of the continuum (absorption). */
    noise: number;
    threshold: number;
    /** In the profile's axis unit: px, or nm as recorded. */
    fwhm_estimate: number;
    lines: ProfileLineJson[];
    dropped: ProfileLineJson[];
    unmatched_drops: number[];
  } | null;
  range_nm: [number, number];
  fwhm_nm: number;
  /** A reading offset (and scale error) fitted and removed before identification, or null. */
  scale_correction: {
    offset_nm: number;
    offset_sigma_nm: number;
    scale: number;
    scale_sigma: number;
    pivot_nm: number;
    against: string[];
    lines_used: number;
    message: string;
  } | null;
  /** Whether the list was taken as every line seen or a selection, and if the session said so. */
  lines_listed: { value: string; stated: boolean };
}

/** Round to a fixed number of significant decimals so the JSON is stable and readable. */
function r(x: number, digits = 6): number {
  if (!Number.isFinite(x)) return x;
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

export interface ProfileLineJson {
  centre: number;
  centre_sigma: number;
  fwhm: number;
  amplitude: number;
  relative: number;
  snr: number;
  origin: string;
}

function profileJson(reduction: Reduction): ResultJson['profile'] {
  const f = reduction.profile;
  const spec = reduction.session.profile;
  if (!f || !spec) return null;
  const line = (l: FoundLine): ProfileLineJson => ({
    centre: r(l.centre, 6),
    centre_sigma: r(l.centre_sigma, 6),
    fwhm: r(l.fwhm, 5),
    amplitude: r(l.amplitude, 6),
    relative: r(l.relative, 5),
    snr: r(l.snr, 2),
    origin: l.origin,
  });
  return {
    file: spec.file,
    sha256: spec.sha256,
    format: spec.data.format,
    axis: spec.data.axis,
    points: spec.data.x.length,
    kind: f.kind,
    threshold_sigma: f.threshold_sigma,
    noise: r(f.noise, 6),
    threshold: r(f.threshold, 6),
    fwhm_estimate: r(f.fwhm_estimate, 5),
    lines: f.lines.map(line),
    dropped: f.dropped.map(line),
    unmatched_drops: f.unmatched_drops,
  };
}

export function buildResult(
  reduction: Reduction,
  identification: Identification,
  catalog: Catalog,
  programVersion: string,
): ResultJson {
  const byIndex = new Map(identification.lines.map((l) => [l.index, l]));
  const originOf = new Map(
    identification.lines.map((l) => [
      l.index,
      l.assignment
        ? referenceOrigin(
            catalog,
            l.assignment.species,
            l.assignment.ref_vacuum_nm,
            l.assignment.blend,
            identification.fwhm_nm,
          )
        : null,
    ]),
  );
  return {
    format: 'lineledger-result/1',
    id: reduction.session.id,
    program: { name: 'lineledger', version: programVersion },
    catalog: { version: catalog.version, sha256: catalog.sha256 },
    reference_origins: countOrigins([...originOf.values()]),
    input: { file: reduction.session.file.replace(/^.*[\\/]/, ''), sha256: reduction.session.input_sha256 },
    medium: reduction.medium,
    status: identification.explanation.status,
    summary: identification.explanation.summary,
    lines: reduction.lines.map((l) => {
      const a = byIndex.get(l.index);
      return {
        index: l.index,
        label: l.label,
        reading: l.reading_text,
        vacuum_nm: r(l.vacuum_nm),
        air_nm: r(l.air_nm),
        sigma_nm: r(l.sigma_nm),
        rest_vacuum_nm: r(l.rest_vacuum_nm),
        rest_sigma_nm: r(l.rest_sigma_nm),
        intensity: l.intensity,
        kind: l.kind,
        combined_with: l.combined_indices,
        status: a?.status ?? 'unexplained',
        probability: r(a?.probability ?? 0, 4),
        assignment: a?.assignment
          ? {
              species: a.assignment.species,
              display: a.assignment.display,
              ref_vacuum_nm: r(a.assignment.ref_vacuum_nm),
              residual_nm: r(a.assignment.residual_nm),
              residual_km_s: r(a.assignment.residual_km_s, 3),
              blend: a.assignment.blend,
              faint: a.assignment.flags.includes(FAINT_FLAG),
              ref_origin: originOf.get(l.index) ?? null,
            }
          : null,
        alternatives: (a?.alternatives ?? []).map((x) => ({
          species: x.species,
          ref_vacuum_nm: r(x.ref_vacuum_nm),
          residual_nm: r(x.residual_nm),
        })),
      };
    }),
    candidates: identification.candidates.map((c) => ({
      species: c.species,
      display: identification.display[c.species] ?? c.species,
      score: r(c.score, 3),
      confidence: r(c.confidence, 4),
      matched: c.matched,
      expected: c.expected,
      false_alarm: r(c.false_alarm, 6),
      rank_correlation: c.rank_correlation === null ? null : r(c.rank_correlation, 3),
      rms_residual_nm: c.rms_residual_nm === null ? null : r(c.rms_residual_nm),
      missing_nm: c.missing_nm.map((x) => r(x, 4)),
    })),
    explanation: {
      species: identification.explanation.species,
      display: identification.explanation.species.map((s) => identification.display[s] ?? s),
      tentative: identification.explanation.tentative,
      unexplained: identification.explanation.unexplained,
      confidence: r(identification.explanation.confidence, 4),
      status: identification.explanation.status,
      contenders: identification.explanation.contenders.map((c) => ({
        species: c.species,
        probability: r(c.probability, 4),
      })),
      discriminators: identification.explanation.discriminators.map((d) => ({
        ...d,
        vacuum_nm: r(d.vacuum_nm, 4),
        air_nm: r(d.air_nm, 4),
      })),
    },
    shift: shiftJson(reduction, identification),
    calibration: reduction.calibration,
    profile: profileJson(reduction),
    range_nm: [r(identification.range_nm[0], 4), r(identification.range_nm[1], 4)],
    fwhm_nm: r(identification.fwhm_nm, 4),
    scale_correction: identification.scale
      ? {
          offset_nm: r(identification.scale.offset_nm, 4),
          offset_sigma_nm: r(identification.scale.offset_sigma_nm, 4),
          scale: r(identification.scale.scale, 8),
          scale_sigma: r(identification.scale.scale_sigma, 8),
          pivot_nm: r(identification.scale.pivot_nm, 3),
          against: identification.scale.against,
          lines_used: identification.scale.lines_used,
          message: identification.scale.message,
        }
      : null,
    lines_listed: identification.lines_listed,
  };
}

function shiftJson(reduction: Reduction, identification: Identification): ResultJson['shift'] {
  const found = identification.shift;
  if (found) {
    return {
      source: 'search',
      z: r(found.z, 8),
      z_sigma: r(found.z_sigma, 8),
      velocity_km_s: r(found.velocity_km_s, 4),
      velocity_sigma_km_s: r(found.velocity_sigma_km_s, 4),
      barycentric: reduction.shift?.barycentric ?? null,
      search: {
        mode: found.mode,
        lines_used: found.lines_used,
        step_z: r(found.step_z, 8),
        barycentric_velocity_km_s:
          found.barycentric_velocity_km_s === null ? null : r(found.barycentric_velocity_km_s, 4),
        runner_up: found.runner_up
          ? {
              z: r(found.runner_up.z, 8),
              velocity_km_s: r(found.runner_up.velocity_km_s, 3),
              score: r(found.runner_up.score, 3),
            }
          : null,
        warning: found.warning,
        scan: found.scan.map((p) => ({
          z: r(p.z, 8),
          velocity_km_s: r(p.velocity_km_s, 3),
          score: r(p.score, 3),
        })),
      },
    };
  }
  const s = reduction.shift;
  if (!s || s.source === 'search') return null;
  return {
    source: s.source,
    z: r(s.z, 8),
    z_sigma: r(s.z_sigma, 8),
    velocity_km_s: r(s.velocity_km_s, 4),
    velocity_sigma_km_s: r(s.velocity_sigma_km_s, 4),
    barycentric: s.barycentric,
  };
}
