/** Which species a session is identified against: its own list and groups, or its source kind's defaults. */

import type { Diagnostic } from '../diagnostics.js';
import type { Catalog } from '../lines/types.js';
import { positionOfField } from '../session/normalize.js';
import { didYouMean } from '../session/suggest.js';
import type { Session } from '../session/types.js';
import { sessionPriors } from './priors.js';

const TELLURIC_KINDS = new Set(['star', 'sky', 'galaxy', 'nebula']);

export function isTelluric(catalog: Catalog, species: string): boolean {
  const lines = catalog.species.get(species);
  return lines !== undefined && lines.flags.length > 0 && lines.flags.every((f) => f.includes('telluric'));
}

export function candidateSpecies(
  session: Session,
  catalog: Catalog,
): { species: string[]; warnings: Diagnostic[] } {
  const warnings: Diagnostic[] = [];
  const warn = (field: string, message: string, hint: string) =>
    warnings.push({
      file: session.file,
      ...positionOfField(session, field),
      severity: 'warning',
      code: 'unknown-candidate',
      field,
      message,
      hint,
    });
  const chosen = new Set<string>();
  const { groups, species, exclude } = session.candidates;
  groups.forEach((id, i) => {
    const group = catalog.groups.get(id);
    if (!group) {
      const guess = didYouMean(id, [...catalog.groups.keys()]);
      warn(
        `candidates.groups[${i}]`,
        `there is no candidate group "${id}"`,
        guess ? `did you mean "${guess}"?` : `known groups: ${[...catalog.groups.keys()].join(', ')}`,
      );
      return;
    }
    for (const s of group.species) chosen.add(s);
  });
  species.forEach((name, i) => {
    if (!catalog.species.has(name)) {
      const guess = didYouMean(name, catalog.names);
      warn(
        `candidates.species[${i}]`,
        `the catalog has no species "${name}"`,
        guess ? `did you mean "${guess}"?` : 'write it as element and ion stage, e.g. "Fe II"',
      );
      return;
    }
    chosen.add(name);
  });
  if (groups.length === 0 && species.length === 0) {
    const defaults = catalog.defaultGroupsBySourceKind.get(session.source.kind) ?? [];
    for (const id of defaults) for (const s of catalog.groups.get(id)?.species ?? []) chosen.add(s);
    // Species the source's priors name (light pollution in a nebula, the Sun in daylight…) join too.
    for (const s of sessionPriors(session, catalog).named.keys()) chosen.add(s);
    if (chosen.size === 0) for (const s of catalog.names) chosen.add(s);
  }
  if (TELLURIC_KINDS.has(session.source.kind)) {
    for (const s of catalog.names) if (isTelluric(catalog, s)) chosen.add(s);
  }
  exclude.forEach((name, i) => {
    if (!catalog.species.has(name))
      warn(`candidates.exclude[${i}]`, `the catalog has no species "${name}"`, 'check the spelling');
    chosen.delete(name);
  });
  return { species: [...chosen].sort(), warnings };
}
