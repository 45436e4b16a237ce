/**
 * Safety cautions by source kind. The usual cautions of school and college labs; every one
 * defers to local rules and qualified supervision, which always take precedence.
 */
import type { SourceClass, SourceKind } from '../session/types.js';

export const GENERAL_CAUTION =
  'Follow your institution’s local rules and risk assessment, and work under qualified supervision; these notes do not replace them.';

const BY_KIND: Record<SourceKind, string[]> = {
  lamp: [
    'Gas discharge tubes run from power supplies of several kilovolts: switch off and unplug before touching a tube or its clips, and never bypass an interlock.',
    'Mercury and some other lamps emit ultraviolet light that harms eyes and skin: keep the lamp in its housing, use UV-blocking shields or glasses, and do not look at the bare tube.',
    'Tubes get hot and are fragile; a broken mercury tube needs the local spill procedure.',
  ],
  flame: [
    'Flame tests use open flames and metal salts, some of them toxic or oxidising (for example barium, strontium, copper and lithium compounds): wear eye protection, tie hair back, keep flammables away and follow the safety data sheets.',
    'Work in a ventilated place and dispose of salts and solvents as local rules require.',
  ],
  star: [
    'Never point a telescope, camera, binoculars or grating set-up at the Sun without a certified solar filter over the front aperture: concentrated sunlight blinds instantly and permanently.',
    'At night sites, watch your footing and keep warm; observe with others where you can.',
  ],
  nebula: ['Never let optics sweep across the Sun; use certified solar filters for any daytime work.'],
  galaxy: ['Never let optics sweep across the Sun; use certified solar filters for any daytime work.'],
  sky: [
    'Never look at the Sun, directly or through any optics or grating, without a certified solar filter; point daytime set-ups at the sky well away from it.',
  ],
  laser: [
    'Never look into a laser beam or its reflections, and never point one at people, vehicles or aircraft; use the laser class your local rules allow, with the eyewear they require.',
    'Remove watches and rings, keep beams below eye level, and block stray reflections from the grating.',
  ],
  other: [
    'Identify the hazards of the source before you measure it (electricity, UV, heat, chemicals, bright light).',
  ],
  unknown: [
    'Identify the hazards of the source before you measure it (electricity, UV, heat, chemicals, bright light).',
  ],
};

const SUN =
  'Never look at the Sun, directly or through any optics or grating, without a certified solar filter; point daytime set-ups at the sky well away from it.';
const NIGHT = 'At night sites, watch your footing and keep warm; observe with others where you can.';
const STREET =
  'Street and industrial lamps are bright at close range and run from mains or higher voltages: observe them from a distance, from a safe place off the road, and never open a fitting.';

/** Where the class says more than the kind, its cautions replace the kind's. */
const BY_CLASS: Partial<Record<SourceClass, string[]>> = {
  'street-light': [STREET],
  'light-pollution': [STREET, NIGHT],
  daylight: [SUN],
  aurora: [NIGHT],
  airglow: [NIGHT],
  sun: [
    'Never look at the Sun, and never point a telescope, camera, binoculars or grating set-up at it without a certified solar filter over the front aperture: concentrated sunlight blinds instantly and permanently.',
  ],
  led: [
    'Bright LEDs can dazzle at close range: do not stare into them; view them through a diffuser or from a distance.',
  ],
  incandescent: [
    'Filament lamps get hot enough to burn: let them cool before touching, and keep them away from paper and fabric.',
  ],
  'gas-flame': [
    'Open flames: wear eye protection, tie hair back, keep flammables away and turn the gas off when not in use.',
  ],
};

export function cautionsFor(kind: SourceKind, sourceClass: SourceClass | null = null): string[] {
  const byClass = sourceClass ? BY_CLASS[sourceClass] : undefined;
  return [...(byClass ?? BY_KIND[kind]), GENERAL_CAUTION];
}

/** Every caution, for the README and the index page. */
export function allCautions(): Record<SourceKind, string[]> {
  return BY_KIND;
}
