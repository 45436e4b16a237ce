/**
 * The priors of one session: data/priors.yaml resolved for its source kind and class.
 * A species the file does not name keeps the uninformed prior (explain.ts speciesPenalty);
 * a named one is weighed by its log prior odds. Also what the list is (all seen or a
 * selection) and whether the catalog's intensities can be trusted for this source.
 */
import type { Catalog, IntensityCondition, PriorEntry, SourcePriorSet } from '../lines/types.js';
import type { Session } from '../session/types.js';

export interface SessionPriors {
  /** Prior probability of each species the priors file names for this source. */
  named: ReadonlyMap<string, PriorEntry>;
  linesListed: 'all-seen' | 'selection';
  /** Whether linesListed came from the session itself (else the kind's default). */
  linesListedStated: boolean;
  labIntensities: 'trust' | 'distrust';
  /**
   * Whose strengths this source shows: a condition of data/lines/conditions.tsv is used for the
   * species it gives strengths for; every other species falls back to the lab column, weighed
   * as labIntensities says.
   */
  intensities: IntensityCondition;
  /** Scatter of this source's line centres about their rest wavelengths, km/s (0: none). */
  lineScatter_km_s: number;
  /** Prior of a species the file does not name for this source; null: the uninformed prior. */
  othersP: number | null;
}

/** Entries of one set, per species: a species named on its own beats a group naming it. */
function perSpecies(set: SourcePriorSet | undefined, into: Map<string, PriorEntry>) {
  if (!set) return;
  const own = new Map<string, PriorEntry>();
  const viaGroup = new Map<string, PriorEntry>();
  for (const e of set.priors) for (const s of e.members) (e.group === null ? own : viaGroup).set(s, e);
  for (const [s, e] of viaGroup) if (!own.has(s)) into.set(s, e);
  for (const [s, e] of own) into.set(s, e);
}

export function sessionPriors(session: Session, catalog: Catalog): SessionPriors {
  const kind = catalog.priors.kinds.get(session.source.kind);
  const cls = session.source.class ? catalog.priors.classes.get(session.source.class) : undefined;
  const named = new Map<string, PriorEntry>();
  // The class overrides its kind species by species; a class that gives `others` names all it
  // expects, so its kind's broad entries (any tube gas in any lamp) do not reach it.
  if (!cls?.others) perSpecies(kind, named);
  perSpecies(cls, named);
  return {
    named,
    linesListed: session.lines_listed ?? cls?.lines_listed ?? kind?.lines_listed ?? 'all-seen',
    linesListedStated: session.lines_listed !== null,
    labIntensities: cls?.lab_intensities ?? kind?.lab_intensities ?? 'trust',
    intensities: cls?.intensities ?? kind?.intensities ?? 'lab',
    lineScatter_km_s: (cls?.line_scatter ?? kind?.line_scatter)?.km_s ?? 0,
    othersP: (cls?.others ?? kind?.others)?.p ?? null,
  };
}

/**
 * Negative log prior odds of a species, nats. One the file does not name takes the source's
 * `others` prior where it gives one (never kinder than the uninformed prior), else `uninformed`.
 */
export function priorPenalty(priors: SessionPriors, species: string, uninformed: number): number {
  const e = priors.named.get(species);
  if (e) return Math.log((1 - e.p) / e.p);
  if (priors.othersP === null) return uninformed;
  return Math.max(uninformed, Math.log((1 - priors.othersP) / priors.othersP));
}
