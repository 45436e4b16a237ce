/**
 * Session file format 1, defined once with TypeBox. The same definition validates files
 * (through Ajv) and is published as a JSON Schema (schema/session-1.schema.json) so that
 * editors validate as people type. TypeBox was chosen because its definitions *are* JSON
 * Schema objects: there is no second translation step that could drift.
 */
import { type Static, type TSchema, Type } from '@sinclair/typebox';
import { SESSION_LIMITS } from './limits.js';
import {
  INTENSITY_WORDS,
  LINE_KINDS,
  LINES_LISTED,
  METHODS,
  SOURCE_CLASSES,
  SOURCE_KINDS,
  WAVELENGTH_UNITS,
} from './vocabulary.js';

const Strict = { additionalProperties: false } as const;

export {
  INTENSITY_WORDS,
  LINE_KINDS,
  LINES_LISTED,
  METHODS,
  SOURCE_CLASS_KIND,
  SOURCE_CLASSES,
  SOURCE_KINDS,
  type SourceClass,
  WAVELENGTH_UNITS,
} from './vocabulary.js';

/** A closed word list as a JSON Schema `enum` (clearer errors than a union of constants). */
function words<T extends readonly string[]>(values: T, description: string) {
  return Type.Unsafe<T[number]>({
    type: 'string',
    enum: [...values],
    description,
    'x-expect': `one of ${values.join(', ')}`,
  });
}

const PositiveNumber = (description: string) => Type.Number({ exclusiveMinimum: 0, description });
const NonNegativeNumber = (description: string) => Type.Number({ minimum: 0, description });

/** Angles may be decimal degrees or a table reading such as `9° 26'` or `9 26`. */
const Angle = (description: string) =>
  Type.Union([Type.Number(), Type.String({ maxLength: 40 })], {
    description,
    'x-expect': "an angle in decimal degrees or degrees and minutes such as 9° 26'",
  });

const IsoDate = Type.String({
  description: 'ISO 8601 date (YYYY-MM-DD) or UTC date-time (YYYY-MM-DDThh:mm[:ss]Z)',
  pattern: '^\\d{4}-\\d{2}-\\d{2}([T ]\\d{2}:\\d{2}(:\\d{2}(\\.\\d+)?)?(Z|[+-]\\d{2}:?\\d{2})?)?$',
  'x-expect': 'a date such as 2026-03-14 or a UTC date-time such as 2026-03-14T21:30:00Z',
});

const Site = Type.Object(
  {
    name: Type.Optional(Type.String({ maxLength: 200 })),
    lat: Type.Optional(
      Type.Number({ minimum: -90, maximum: 90, description: 'Geodetic latitude, degrees north' }),
    ),
    lon: Type.Optional(Type.Number({ minimum: -180, maximum: 360, description: 'Longitude, degrees east' })),
    elevation_m: Type.Optional(Type.Number({ minimum: -500, maximum: 10000 })),
  },
  { ...Strict, description: 'Where the measurement was made' },
);

const Source = Type.Object(
  {
    kind: words(SOURCE_KINDS, 'What kind of light source was measured'),
    class: Type.Optional(
      words(SOURCE_CLASSES, 'A finer class of source (for example fluorescent, planetary-nebula, cool-star)'),
    ),
    name: Type.Optional(Type.String({ maxLength: 200 })),
  },
  { ...Strict, description: 'The light source' },
);

const Instrument = Type.Object(
  {
    description: Type.Optional(Type.String({ maxLength: 500 })),
    resolution_nm: Type.Optional(PositiveNumber('Resolution as a FWHM in nm')),
    resolving_power: Type.Optional(PositiveNumber('Resolving power λ/Δλ (instead of resolution_nm)')),
    range_nm: Type.Optional(
      Type.Array(PositiveNumber('nm'), {
        minItems: 2,
        maxItems: 2,
        description: 'The wavelength range the set-up could see, [from, to] in nm',
      }),
    ),
  },
  { ...Strict, description: 'The instrument' },
);

const Candidates = Type.Object(
  {
    groups: Type.Optional(Type.Array(Type.String({ maxLength: 60 }), { maxItems: 50 })),
    species: Type.Optional(Type.Array(Type.String({ maxLength: 40 }), { maxItems: 200 })),
    exclude: Type.Optional(Type.Array(Type.String({ maxLength: 40 }), { maxItems: 200 })),
  },
  { ...Strict, description: 'Narrow the species considered' },
);

const SearchRange = Type.Object(
  { search: Type.Array(Type.Number(), { minItems: 2, maxItems: 2, description: '[from, to]' }) },
  Strict,
);

const Barycentric = Type.Object(
  {
    ra: Type.Union([Type.Number(), Type.String({ maxLength: 40 })], {
      'x-expect': 'right ascension in degrees or as "18h36m56s"',
    }),
    dec: Type.Union([Type.Number(), Type.String({ maxLength: 40 })], {
      'x-expect': 'declination in degrees or as "+38d47m01s"',
    }),
  },
  { ...Strict, description: 'Target coordinates (ICRS/J2000) for a barycentric correction' },
);

const Shift = Type.Object(
  {
    velocity_km_s: Type.Optional(
      Type.Union([Type.Number({ minimum: -299792, maximum: 299792 }), SearchRange], {
        'x-expect': 'a radial velocity in km/s or { search: [from, to] }',
      }),
    ),
    velocity_sigma_km_s: Type.Optional(NonNegativeNumber('Uncertainty of a known velocity')),
    redshift: Type.Optional(
      Type.Union([Type.Number({ exclusiveMinimum: -1 }), SearchRange], {
        'x-expect': 'a redshift z or { search: [from, to] }',
      }),
    ),
    redshift_sigma: Type.Optional(NonNegativeNumber('Uncertainty of a known redshift')),
    barycentric: Type.Optional(Barycentric),
  },
  { ...Strict, description: 'Doppler shift to remove, or to search for' },
);

const Grating = Type.Object(
  {
    lines_per_mm: Type.Optional(PositiveNumber('Groove density')),
    spacing_um: Type.Optional(PositiveNumber('Groove spacing d in µm (instead of lines_per_mm)')),
    lines_per_mm_sigma: Type.Optional(NonNegativeNumber('Uncertainty of the groove density')),
    spacing_sigma_um: Type.Optional(NonNegativeNumber('Uncertainty of the spacing')),
    type: Type.Optional(words(['transmission', 'reflection'] as const, 'Transmission or reflection grating')),
  },
  { ...Strict, description: 'The grating' },
);

const CalibrationLine = Type.Object(
  {
    pixel: Type.Number(),
    wavelength: PositiveNumber('Known wavelength, in the measurement unit and medium'),
    pixel_sigma: Type.Optional(NonNegativeNumber('Uncertainty of the pixel position')),
    label: Type.Optional(Type.String({ maxLength: 80 })),
  },
  Strict,
);

const Calibration = Type.Object(
  {
    lines: Type.Optional(Type.Array(CalibrationLine, { maxItems: 500 })),
    degree: Type.Optional(Type.Integer({ minimum: 1, maximum: 3 })),
    zero_order_pixel: Type.Optional(
      Type.Number({ description: 'Slitless: pixel of the zeroth-order image' }),
    ),
    dispersion_nm_per_px: Type.Optional(PositiveNumber('Slitless: known dispersion')),
    pixel_size_um: Type.Optional(PositiveNumber('Slitless: sensor pixel size')),
    sensor_distance_mm: Type.Optional(PositiveNumber('Slitless: grating-to-sensor distance')),
  },
  { ...Strict, description: 'How pixel columns map to wavelength' },
);

const Measurement = Type.Object(
  {
    method: Type.Optional(words(METHODS, 'How line positions were read')),
    unit: Type.Optional(
      words(WAVELENGTH_UNITS, 'Unit of wavelengths (method wavelength, calibration lines)'),
    ),
    sigma: Type.Optional(NonNegativeNumber("Default uncertainty of one reading, in the reading's unit")),
    grating: Type.Optional(Grating),
    order: Type.Optional(Type.Integer({ description: 'Diffraction order m (not 0)' })),
    incidence_deg: Type.Optional(Type.Number({ minimum: -89.999, maximum: 89.999 })),
    screen_distance_mm: Type.Optional(Type.Number({ description: 'Grating-to-screen distance' })),
    screen_distance_sigma_mm: Type.Optional(NonNegativeNumber('Uncertainty of the screen distance')),
    calibration: Type.Optional(Calibration),
  },
  { ...Strict, description: 'How the line positions were measured' },
);

const Intensity = Type.Union([Type.Number({ minimum: 0 }), words(INTENSITY_WORDS, 'Intensity word')], {
  description: 'Relative intensity (or depth for absorption): a number or a word',
  'x-expect': `a number ≥ 0 or one of ${INTENSITY_WORDS.join(', ')}`,
});

const Line = Type.Object(
  {
    wavelength: Type.Optional(
      Type.Number({
        exclusiveMinimum: 0,
        description: 'Wavelength, in measurement.unit (method wavelength)',
        'x-expect': 'a positive wavelength in measurement.unit',
      }),
    ),
    sigma: Type.Optional(NonNegativeNumber("Uncertainty of this reading, in the reading's unit")),
    intensity: Type.Optional(Intensity),
    kind: Type.Optional(
      words(
        LINE_KINDS,
        'Emission or absorption (default: absorption for stars but Wolf–Rayet stars, novae and supernovae, and for daylight; else emission)',
      ),
    ),
    width_nm: Type.Optional(NonNegativeNumber('Observed FWHM')),
    label: Type.Optional(Type.String({ maxLength: 200 })),
    order: Type.Optional(
      Type.Integer({ description: 'Order of this reading, overriding measurement.order' }),
    ),
    angle_deg: Type.Optional(Angle('Diffraction angle from the straight-through direction')),
    angle_left_deg: Type.Optional(Angle('Table reading on one side')),
    angle_right_deg: Type.Optional(Angle('Table reading on the other side')),
    offset_mm: Type.Optional(Type.Number({ description: 'Offset on the screen from the central maximum' })),
    separation_mm: Type.Optional(PositiveNumber('Distance between the +m and −m maxima on the screen')),
    pixel: Type.Optional(Type.Number({ description: 'Pixel column of the line' })),
    same_as: Type.Optional(
      Type.Integer({ minimum: 0, description: 'Index of another reading of the same line (combined)' }),
    ),
  },
  { ...Strict, description: 'One measured line' },
);

/**
 * A recorded spectrum beside the session: its lines are found automatically (reduce stage),
 * and `add` / `drop` record what the observer decided about them.
 */
const Profile = Type.Object(
  {
    file: Type.String({
      minLength: 1,
      maxLength: 300,
      description:
        'The profile file, relative to this session file and inside its folder: CSV/TSV columns (position, intensity, optional uncertainty) or a 1-D FITS spectrum',
      'x-expect': 'a file name beside the session, such as tube-c.csv',
    }),
    kind: Type.Optional(
      words(
        LINE_KINDS,
        'Look for emission peaks or absorption dips (default: absorption for stars but Wolf–Rayet stars, novae and supernovae, and for daylight)',
      ),
    ),
    threshold: Type.Optional(
      Type.Number({
        minimum: 2,
        maximum: 1000,
        description: 'Detection threshold in units of the noise estimated from the profile (default 5)',
      }),
    ),
    add: Type.Optional(
      Type.Array(Type.Number(), {
        maxItems: 500,
        description:
          'Positions (pixel, or wavelength in measurement.unit) of lines the finder missed; each is fitted there',
      }),
    ),
    drop: Type.Optional(
      Type.Array(Type.Number(), {
        maxItems: 500,
        description:
          'Positions of found lines to leave out (a cosmic-ray spike, a ghost): the found line nearest each, within its FWHM',
      }),
    ),
    edit: Type.Optional(
      Type.Array(
        Type.Object(
          {
            at: Type.Number({ description: 'Position of the found line (the one nearest, within its FWHM)' }),
            label: Type.Optional(
              Type.String({
                minLength: 1,
                maxLength: 120,
                description: 'A label for the line, as for a typed line',
              }),
            ),
            sigma: Type.Optional(
              Type.Number({
                exclusiveMinimum: 0,
                description:
                  "The line's uncertainty to use instead of the fit's (pixel, or measurement.unit), e.g. for a known systematic",
              }),
            ),
          },
          Strict,
        ),
        {
          maxItems: 500,
          description:
            'Found lines the observer labels or gives another σ: the session stays the record of what was decided',
        },
      ),
    ),
  },
  { ...Strict, description: 'Find the lines in a recorded profile instead of listing them' },
);

export const SessionSchema = Type.Object(
  {
    $schema: Type.Optional(Type.String()),
    lineledger: Type.Literal(1, { description: 'Format version', 'x-expect': 'the number 1' }),
    id: Type.Optional(
      Type.String({
        pattern: '^[a-z0-9]([a-z0-9-]{0,78}[a-z0-9])?$',
        description: 'Session id: lower-case letters, digits and dashes',
        'x-expect': 'lower-case letters, digits and dashes, such as tube-b-2026-03-14',
      }),
    ),
    title: Type.Optional(Type.String({ maxLength: 300 })),
    date: Type.Optional(IsoDate),
    observer: Type.Optional(Type.String({ maxLength: 300 })),
    site: Type.Optional(Site),
    source: Type.Optional(Source),
    instrument: Type.Optional(Instrument),
    medium: Type.Optional(words(['air', 'vacuum'] as const, 'What the measured wavelengths refer to')),
    candidates: Type.Optional(Candidates),
    shift: Type.Optional(Shift),
    measurement: Type.Optional(Measurement),
    lines_listed: Type.Optional(
      words(LINES_LISTED, 'Whether the lines below are every line seen (all-seen) or a selection'),
    ),
    profile: Type.Optional(Profile),
    lines: Type.Optional(
      Type.Array(Line, {
        minItems: 1,
        maxItems: SESSION_LIMITS.maxLines,
        description: 'The measured lines (or give a profile: and let its lines be found)',
      }),
    ),
    notes: Type.Optional(Type.String({ maxLength: 100_000, description: 'Markdown' })),
  },
  {
    ...Strict,
    $id: 'https://lineledger.invalid/schema/session-1.schema.json',
    title: 'lineledger session, format 1',
  },
);

export type SessionDocument = Static<typeof SessionSchema>;
export type LineDocument = NonNullable<SessionDocument['lines']>[number];
export type ProfileDocument = NonNullable<SessionDocument['profile']>;

/** The JSON Schema document we publish (draft 2020-12 compatible subset, plain JSON). */
export function sessionJsonSchema(): Record<string, unknown> {
  const plain = JSON.parse(JSON.stringify(SessionSchema as TSchema)) as Record<string, unknown>;
  return { $schema: 'https://json-schema.org/draft/2020-12/schema', ...plain };
}
