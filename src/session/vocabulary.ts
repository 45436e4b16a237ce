/**
 * The closed word lists of the session format, as plain constants: the schema (schema.ts, built
 * with TypeBox) and the stages after reading share them, and the stages need not load TypeBox
 * to know them.
 */
export const SOURCE_KINDS = [
  'lamp',
  'flame',
  'star',
  'nebula',
  'galaxy',
  'sky',
  'laser',
  'other',
  'unknown',
] as const;
/**
 * Finer classes of source an observer may name (`source.class`). They select priors and line
 * strengths in identification; each belongs to one kind (SOURCE_CLASS_KIND).
 */
export const SOURCE_CLASS_KIND = {
  'discharge-tube': 'lamp',
  fluorescent: 'lamp',
  led: 'lamp',
  'street-light': 'lamp',
  incandescent: 'lamp',
  'flame-test': 'flame',
  'gas-flame': 'flame',
  sun: 'star',
  'hot-star': 'star',
  'cool-star': 'star',
  'wolf-rayet': 'star',
  nova: 'star',
  supernova: 'star',
  'planetary-nebula': 'nebula',
  'h-ii-region': 'nebula',
  'supernova-remnant': 'nebula',
  quasar: 'galaxy',
  seyfert: 'galaxy',
  starburst: 'galaxy',
  daylight: 'sky',
  aurora: 'sky',
  airglow: 'sky',
  'light-pollution': 'sky',
} as const;
export type SourceClass = keyof typeof SOURCE_CLASS_KIND;
export const SOURCE_CLASSES = Object.keys(SOURCE_CLASS_KIND) as SourceClass[];
/** Whether the session's lines are every line that was seen, or a chosen selection. */
export const LINES_LISTED = ['all-seen', 'selection'] as const;
export const METHODS = ['wavelength', 'grating-angle', 'screen', 'pixel'] as const;
export const WAVELENGTH_UNITS = ['nm', 'angstrom', 'um'] as const;
export const INTENSITY_WORDS = ['very-weak', 'weak', 'medium', 'strong', 'very-strong'] as const;
export const LINE_KINDS = ['emission', 'absorption'] as const;

/**
 * Classes of a star whose spectrum is mostly emission lines: Wolf–Rayet winds, novae and
 * supernovae (Gray & Corbally 2009, Stellar Spectral Classification, chapters on Wolf–Rayet
 * stars and novae; from memory).
 */
const EMISSION_STAR_CLASSES: ReadonlySet<string> = new Set(['wolf-rayet', 'nova', 'supernova']);

/**
 * A line's kind when the session does not say: absorption for stars (a photosphere seen
 * through its own cooler layers) and for daylight (scattered sunlight, the Fraunhofer lines),
 * except the emission-line stars above; emission for everything else.
 */
export function defaultLineKind(
  kind: string | undefined,
  cls: string | null | undefined,
): (typeof LINE_KINDS)[number] {
  if (kind === 'star') return cls && EMISSION_STAR_CLASSES.has(cls) ? 'emission' : 'absorption';
  return kind === 'sky' && cls === 'daylight' ? 'absorption' : 'emission';
}
