/**
 * Safety cautions by source kind. The usual cautions of school and college labs; every one
 * defers to local rules and qualified supervision, which always take precedence.
 */
import type { SourceKind } from '../session/types.js';

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
    'Never look at the Sun, directly or through any optics or grating, without a certified solar filter.',
    'Street and industrial lamps can be bright at close range; observe them from a distance.',
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

export function cautionsFor(kind: SourceKind): string[] {
  return [...BY_KIND[kind], GENERAL_CAUTION];
}

/** Every caution, for the README and the index page. */
export function allCautions(): Record<SourceKind, string[]> {
  return BY_KIND;
}
