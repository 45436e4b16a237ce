/**
 * Schema-valid document → typed Session. Checks what a schema cannot say on its own:
 * which position fields each measurement method needs, mixed methods, impossible values.
 */
import { createHash } from 'node:crypto';
import type { Diagnostic, SourcePosition } from '../diagnostics.js';
import { parseAngleDeg, parseDeclinationDeg, parseRightAscensionDeg } from './angles.js';
import { checkLineKeys, checkShift, checkValues, checkWavelengths, impossibleDate } from './plausible.js';
import type { LineDocument, SessionDocument } from './schema.js';
import type {
  BarycentricRequest,
  GratingSpec,
  InstrumentSpec,
  LineKind,
  MeasurementMethod,
  MeasurementSpec,
  RawLine,
  Session,
  ShiftRequest,
} from './types.js';
import { defaultLineKind, INTENSITY_WORDS, SOURCE_CLASS_KIND } from './vocabulary.js';
import { type FieldPath, fieldName, type YamlSource } from './yamlSource.js';

/** The per-line keys that carry a position, by method. */
const POSITION_KEYS: Record<MeasurementMethod, readonly (keyof LineDocument)[]> = {
  wavelength: ['wavelength'],
  'grating-angle': ['angle_deg', 'angle_left_deg', 'angle_right_deg'],
  screen: ['offset_mm', 'separation_mm'],
  pixel: ['pixel'],
};
const ALL_POSITION_KEYS = Object.values(POSITION_KEYS).flat();

/**
 * A file name's id: lower-case letters, digits and dashes. A name with none of those
 * (`日本語.yaml`, `🙂.yaml`, `..yaml`) gets `session-` and a hash of the name, so such files
 * stay apart. Backslashes separate folders only in Windows paths (a drive or UNC prefix, or
 * on Windows); elsewhere `a\b.yaml` is one name.
 */
export function sessionIdFromFileName(fileName: string): string {
  const windows = process.platform === 'win32' || /^([A-Za-z]:)?\\/.test(fileName);
  const base = fileName.replace(windows ? /^.*[\\/]/ : /^.*\//, '').replace(/\.ya?ml$/i, '');
  const id = base
    .toLowerCase()
    .replace(/[^a-z0-9-]+/g, '-')
    .replace(/-+/g, '-')
    .replace(/^-|-$/g, '')
    .slice(0, 80);
  return id || `session-${createHash('sha256').update(base).digest('hex').slice(0, 8)}`;
}

export function normalizeSession(
  doc: SessionDocument,
  source: YamlSource,
  file: string,
  bytes: Uint8Array | string,
  defaults: InstrumentSpec | null = null,
): { session: Session | null; diagnostics: Diagnostic[] } {
  const diagnostics: Diagnostic[] = [];
  const problem = (path: FieldPath, code: string, message: string, hint?: string, key = false) => {
    diagnostics.push({
      file,
      ...source.positionOf(path, key),
      severity: 'error',
      code,
      field: fieldName(path),
      message,
      hint,
    });
  };

  checkValues(doc, problem);
  checkWavelengths(doc, problem);
  checkShift(doc, problem);
  const badDate = doc.date === undefined ? null : impossibleDate(doc.date);
  if (badDate)
    problem(['date'], 'invalid-date', `no such date: ${badDate}`, 'write the date the session was taken');

  const sourceClass = doc.source?.class;
  if (sourceClass !== undefined && doc.source && SOURCE_CLASS_KIND[sourceClass] !== doc.source.kind) {
    problem(
      ['source', 'class'],
      'invalid-value',
      `class ${sourceClass} is a class of kind ${SOURCE_CLASS_KIND[sourceClass]}, not ${doc.source.kind}`,
      `use kind: ${SOURCE_CLASS_KIND[sourceClass]}, or leave class out`,
    );
  }

  const m = doc.measurement ?? {};
  const method: MeasurementMethod = m.method ?? 'wavelength';
  const grating = readGrating(m.grating, problem);
  if ((method === 'grating-angle' || method === 'screen') && grating === null && !m.grating) {
    problem(
      ['measurement'],
      'missing-key',
      `method ${method} needs measurement.grating`,
      'add grating: { lines_per_mm: 300 }',
    );
  }
  const order = m.order ?? 1;
  if (m.order === 0)
    problem(
      ['measurement', 'order'],
      'invalid-value',
      'order 0 carries no wavelength information',
      'use 1 (or the order you read)',
    );
  if (method === 'screen') {
    if (m.screen_distance_mm === undefined) {
      problem(
        ['measurement'],
        'missing-key',
        'method screen needs measurement.screen_distance_mm',
        'add the grating-to-screen distance in mm',
      );
    } else if (!(m.screen_distance_mm > 0)) {
      problem(
        ['measurement', 'screen_distance_mm'],
        'invalid-value',
        'screen distance must be greater than 0',
        'measure the grating-to-screen distance in mm',
      );
    }
  }
  const calibration = readCalibration(m.calibration, method, problem, source);

  if (doc.lines === undefined && doc.profile === undefined)
    problem(
      [],
      'missing-key',
      'the session has neither lines: nor a profile:',
      'list the measured lines under lines:, or name a recorded profile under profile: { file: … }',
    );
  if (doc.lines !== undefined && doc.profile !== undefined)
    problem(
      ['profile'],
      'conflicting-keys',
      'give lines: or a profile:, not both',
      'with a profile, add a line the finder missed under profile.add and drop one under profile.drop',
      true,
    );
  if (doc.profile !== undefined && method !== 'pixel' && method !== 'wavelength')
    problem(
      ['profile'],
      'invalid-value',
      `a profile's lines are pixel or wavelength positions, not readings of method ${method}`,
      'use method: pixel (a camera profile, with a calibration) or method: wavelength',
      true,
    );
  const lines: RawLine[] = (doc.lines ?? []).map((line, index) =>
    readLine(line, index, method, doc, source, problem),
  );
  for (const line of lines) {
    if (line.same_as !== null && (line.same_as >= lines.length || line.same_as === line.index)) {
      problem(
        ['lines', line.index, 'same_as'],
        'invalid-value',
        `same_as must name another line (0…${lines.length - 1})`,
      );
    }
  }

  const range = doc.instrument?.range_nm;
  if (range && !(range[0]! < range[1]!)) {
    problem(['instrument', 'range_nm'], 'invalid-value', 'range_nm must be [from, to] with from < to');
  }

  const shift = readShift(doc, problem);
  let barycentric: BarycentricRequest | null = null;
  if (doc.shift?.barycentric) {
    const ra = parseRightAscensionDeg(doc.shift.barycentric.ra);
    const dec = parseDeclinationDeg(doc.shift.barycentric.dec);
    if (ra === null)
      problem(
        ['shift', 'barycentric', 'ra'],
        'invalid-value',
        'cannot read this right ascension',
        'write it as 18h36m56s or in degrees',
      );
    if (dec === null)
      problem(
        ['shift', 'barycentric', 'dec'],
        'invalid-value',
        'cannot read this declination',
        'write it as +38d47m01s or in degrees',
      );
    if (!doc.date || (!doc.date.includes('T') && !doc.date.includes(' '))) {
      problem(
        ['date'],
        'missing-key',
        'a barycentric correction needs a UTC date-time',
        'write date: 2026-03-14T21:30:00Z',
      );
    }
    if (doc.site?.lat === undefined || doc.site?.lon === undefined) {
      problem(['site'], 'missing-key', 'a barycentric correction needs site.lat and site.lon');
    }
    if (ra !== null && dec !== null) barycentric = { ra_deg: ra, dec_deg: dec };
  }

  if (diagnostics.length > 0) return { session: null, diagnostics };

  const measurement: MeasurementSpec = {
    method,
    unit: m.unit ?? 'nm',
    sigma: m.sigma ?? null,
    grating,
    order,
    incidence_deg: m.incidence_deg ?? 0,
    screen_distance_mm: m.screen_distance_mm ?? null,
    screen_distance_sigma_mm: m.screen_distance_sigma_mm ?? 0,
    calibration,
  };
  const session: Session = {
    id: doc.id ?? sessionIdFromFileName(file),
    file,
    title: doc.title ?? doc.id ?? sessionIdFromFileName(file),
    date: doc.date ?? null,
    observer: doc.observer ?? null,
    site: doc.site
      ? {
          name: doc.site.name ?? null,
          lat: doc.site.lat ?? null,
          lon: doc.site.lon ?? null,
          elevation_m: doc.site.elevation_m ?? null,
        }
      : null,
    source: {
      kind: doc.source?.kind ?? 'unknown',
      class: doc.source?.class ?? null,
      name: doc.source?.name ?? null,
    },
    lines_listed: doc.lines_listed ?? null,
    instrument: {
      description: doc.instrument?.description ?? defaults?.description ?? null,
      // A session's own resolution (either form) wins over both forms of the default.
      resolution_nm:
        doc.instrument?.resolution_nm ??
        (doc.instrument?.resolving_power ? null : (defaults?.resolution_nm ?? null)),
      resolving_power:
        doc.instrument?.resolving_power ??
        (doc.instrument?.resolution_nm ? null : (defaults?.resolving_power ?? null)),
      range_nm: range ? [range[0]!, range[1]!] : (defaults?.range_nm ?? null),
    },
    medium: doc.medium ?? 'air',
    candidates: {
      groups: doc.candidates?.groups ?? [],
      species: doc.candidates?.species ?? [],
      exclude: doc.candidates?.exclude ?? [],
    },
    shift,
    barycentric,
    measurement,
    lines,
    profile: null,
    notes: doc.notes ?? '',
    input_sha256: createHash('sha256').update(bytes).digest('hex'),
    field_positions: fieldPositions(doc, source),
  };
  return { session, diagnostics };
}

type Problem = (path: FieldPath, code: string, message: string, hint?: string, key?: boolean) => void;

function readGrating(
  g: NonNullable<SessionDocument['measurement']>['grating'],
  problem: Problem,
): GratingSpec | null {
  if (!g) return null;
  if (g.lines_per_mm !== undefined && g.spacing_um !== undefined) {
    problem(['measurement', 'grating'], 'conflicting-keys', 'give lines_per_mm or spacing_um, not both');
    return null;
  }
  if (g.lines_per_mm !== undefined) {
    const spacing_nm = 1e6 / g.lines_per_mm;
    const rel = (g.lines_per_mm_sigma ?? 0) / g.lines_per_mm;
    return { spacing_nm, spacing_sigma_nm: spacing_nm * rel, type: g.type ?? 'transmission' };
  }
  if (g.spacing_um !== undefined) {
    return {
      spacing_nm: g.spacing_um * 1000,
      spacing_sigma_nm: (g.spacing_sigma_um ?? 0) * 1000,
      type: g.type ?? 'transmission',
    };
  }
  problem(
    ['measurement', 'grating'],
    'missing-key',
    'the grating needs lines_per_mm or spacing_um',
    'add lines_per_mm: 300',
  );
  return null;
}

function readCalibration(
  c: NonNullable<SessionDocument['measurement']>['calibration'],
  method: MeasurementMethod,
  problem: Problem,
  source: YamlSource,
): MeasurementSpec['calibration'] {
  if (method !== 'pixel') {
    if (c)
      problem(
        ['measurement', 'calibration'],
        'unused-key',
        `calibration is only used with method pixel, not ${method}`,
        'remove it or set method: pixel',
        true,
      );
    return null;
  }
  if (!c) {
    problem(
      ['measurement'],
      'missing-key',
      'method pixel needs measurement.calibration',
      'add calibration lines of known wavelength, or zero_order_pixel with dispersion_nm_per_px',
    );
    return null;
  }
  const degree = c.degree ?? 1;
  const points = (c.lines ?? []).map((p, i) => ({
    pixel: p.pixel,
    pixel_sigma: p.pixel_sigma ?? 0,
    wavelength: p.wavelength,
    label: p.label ?? null,
    position: source.positionOf(['measurement', 'calibration', 'lines', i]),
  }));
  const slitless = c.zero_order_pixel !== undefined;
  if (!slitless && points.length < degree + 2) {
    problem(
      ['measurement', 'calibration', c.lines ? 'lines' : 'degree'],
      'too-few-calibration-lines',
      `a degree-${degree} fit needs at least ${degree + 2} calibration lines; ${points.length} given`,
      'add calibration lines or lower the degree',
    );
  }
  if (
    slitless &&
    c.dispersion_nm_per_px === undefined &&
    (c.pixel_size_um === undefined || c.sensor_distance_mm === undefined)
  ) {
    problem(
      ['measurement', 'calibration'],
      'missing-key',
      'slitless mode needs dispersion_nm_per_px, or pixel_size_um with sensor_distance_mm',
    );
  }
  return {
    points,
    degree,
    zero_order_pixel: c.zero_order_pixel ?? null,
    dispersion_nm_per_px: c.dispersion_nm_per_px ?? null,
    pixel_size_um: c.pixel_size_um ?? null,
    sensor_distance_mm: c.sensor_distance_mm ?? null,
  };
}

function readLine(
  line: LineDocument,
  index: number,
  method: MeasurementMethod,
  doc: SessionDocument,
  source: YamlSource,
  problem: Problem,
): RawLine {
  const at: FieldPath = ['lines', index];
  checkLineKeys(line, at, problem);
  const wanted = POSITION_KEYS[method];
  const present = ALL_POSITION_KEYS.filter((k) => line[k] !== undefined);
  for (const k of present) {
    if (!wanted.includes(k)) {
      problem(
        [...at, k],
        'mixed-methods',
        `"${k}" does not belong to method ${method}`,
        `use ${wanted.join(' or ')}, or change measurement.method`,
        true,
      );
    }
  }
  const readAngle = (k: 'angle_deg' | 'angle_left_deg' | 'angle_right_deg'): number | null => {
    const v = line[k];
    if (v === undefined) return null;
    const deg = parseAngleDeg(v);
    if (deg === null)
      problem(
        [...at, k],
        'invalid-angle',
        `cannot read the angle ${JSON.stringify(v)}`,
        "write decimal degrees or degrees and minutes such as 9° 26'",
      );
    // A diffraction angle stays below 90°; table readings (left/right) run round a 0–360° circle.
    else if (k === 'angle_deg' && Math.abs(deg) >= 90)
      problem(
        [...at, k],
        'invalid-angle',
        `an angle of ${deg.toFixed(3)}° is past 90°`,
        'a diffracted beam leaves the grating below 90°',
      );
    else if (k !== 'angle_deg' && (deg < 0 || deg >= 360))
      problem(
        [...at, k],
        'invalid-angle',
        `a table reading of ${deg.toFixed(3)}° is outside 0–360°`,
        'write the reading as the table shows it',
      );
    return deg;
  };
  const angle_deg = readAngle('angle_deg');
  const angle_left_deg = readAngle('angle_left_deg');
  const angle_right_deg = readAngle('angle_right_deg');
  switch (method) {
    case 'wavelength':
      if (line.wavelength === undefined)
        problem(at, 'missing-key', 'this line has no wavelength', 'add wavelength: (in measurement.unit)');
      else if (!(line.wavelength > 0))
        problem(
          [...at, 'wavelength'],
          'invalid-value',
          `a wavelength must be positive, not ${line.wavelength}`,
        );
      break;
    case 'grating-angle':
      if (
        angle_deg === null &&
        (angle_left_deg === null || angle_right_deg === null) &&
        !present.some((k) => k.startsWith('angle'))
      ) {
        problem(
          at,
          'missing-key',
          'this line has no angle',
          'add angle_deg, or angle_left_deg and angle_right_deg',
        );
      } else if (
        line.angle_deg === undefined &&
        (line.angle_left_deg === undefined) !== (line.angle_right_deg === undefined)
      ) {
        problem(at, 'missing-key', 'give both angle_left_deg and angle_right_deg (or angle_deg)');
      }
      break;
    case 'screen':
      if (line.offset_mm === undefined && line.separation_mm === undefined)
        problem(at, 'missing-key', 'this line has no screen position', 'add offset_mm or separation_mm');
      break;
    case 'pixel':
      if (line.pixel === undefined)
        problem(at, 'missing-key', 'this line has no pixel position', 'add pixel:');
      break;
  }
  if (line.order === 0)
    problem([...at, 'order'], 'invalid-value', 'order 0 carries no wavelength information');
  const kind: LineKind = line.kind ?? defaultLineKind(doc.source?.kind, doc.source?.class);
  return {
    index,
    position: source.positionOf(at),
    wavelength: line.wavelength ?? null,
    angle_deg,
    angle_left_deg,
    angle_right_deg,
    offset_mm: line.offset_mm ?? null,
    separation_mm: line.separation_mm ?? null,
    pixel: line.pixel ?? null,
    sigma: line.sigma ?? null,
    order: line.order ?? null,
    same_as: line.same_as ?? null,
    intensity: intensityValue(line.intensity),
    kind,
    width_nm: line.width_nm ?? null,
    label: line.label ?? null,
  };
}

/** Word intensities map to 1…5 (very-weak…very-strong); only their order matters downstream. */
export function intensityValue(v: number | string | undefined): number | null {
  if (v === undefined) return null;
  if (typeof v === 'number') return v;
  const i = (INTENSITY_WORDS as readonly string[]).indexOf(v);
  return i >= 0 ? i + 1 : null;
}

function readShift(doc: SessionDocument, problem: Problem): ShiftRequest {
  const s = doc.shift;
  if (!s) return { mode: 'none' };
  if (s.velocity_km_s !== undefined && s.redshift !== undefined) {
    problem(['shift'], 'conflicting-keys', 'give velocity_km_s or redshift, not both');
    return { mode: 'none' };
  }
  const v = s.velocity_km_s;
  if (typeof v === 'number')
    return { mode: 'velocity', velocity_km_s: v, sigma_km_s: s.velocity_sigma_km_s ?? 0 };
  if (v)
    return searchRange(v.search, ['shift', 'velocity_km_s', 'search'], problem, (a, b) => ({
      mode: 'velocity-search',
      from_km_s: a,
      to_km_s: b,
    }));
  const z = s.redshift;
  if (typeof z === 'number') return { mode: 'redshift', z, sigma: s.redshift_sigma ?? 0 };
  if (z) {
    if (z.search[0]! <= -1)
      problem(['shift', 'redshift', 'search'], 'invalid-value', 'a redshift search must start above -1');
    return searchRange(z.search, ['shift', 'redshift', 'search'], problem, (a, b) => ({
      mode: 'redshift-search',
      from: a,
      to: b,
    }));
  }
  return { mode: 'none' };
}

function searchRange(
  range: number[],
  path: FieldPath,
  problem: Problem,
  make: (from: number, to: number) => ShiftRequest,
): ShiftRequest {
  const [a, b] = range as [number, number];
  if (!(a < b)) problem(path, 'invalid-value', 'a search range is [from, to] with from < to');
  return make(a, b);
}

/** Positions of every field but the lines' own and the notes' text (those are found otherwise). */
function fieldPositions(doc: SessionDocument, source: YamlSource): Record<string, SourcePosition> {
  const out: Record<string, SourcePosition> = {};
  const walk = (value: unknown, path: (string | number)[]) => {
    if (path.length > 0) out[fieldName(path)] = source.positionOf(path);
    if (path[0] === 'lines' && path.length >= 1) return;
    if (Array.isArray(value)) {
      for (let i = 0; i < value.length; i++) walk(value[i], [...path, i]);
    } else if (value !== null && typeof value === 'object') {
      for (const [k, v] of Object.entries(value)) walk(v, [...path, k]);
    }
  };
  walk(doc, []);
  return out;
}

/** The position of a field, or of its nearest ancestor that is in the file (1:1 when none is). */
export function positionOfField(session: Pick<Session, 'field_positions'>, field: string): SourcePosition {
  let f = field;
  while (f) {
    const hit = session.field_positions[f];
    if (hit) return hit;
    const cut = Math.max(f.lastIndexOf('.'), f.lastIndexOf('['));
    if (cut <= 0) break;
    f = f.slice(0, cut);
  }
  return { line: 1, col: 1 };
}
