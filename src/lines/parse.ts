/**
 * Catalog files → Catalog. The TSV format is DESIGN.md's: species, vacuum_nm, air_nm, unc_nm,
 * intensity, flags, source, origin. Pure: the files' text comes in, problems go out as values.
 */
import { createHash } from 'node:crypto';
import { parse as parseYaml } from 'yaml';
import type { Diagnostic, Outcome } from '../diagnostics.js';
import { type ConditionRow, joinConditions, parseConditionFile } from './conditions.js';
import { EMPTY_PRIORS, parsePriors } from './priors.js';
import { eachTsvRow, type TsvProblem } from './tsv.js';
import {
  type CandidateGroup,
  type Catalog,
  type CatalogFile,
  LINE_ORIGINS,
  type LineOrigin,
  type SourceCitation,
  type SpeciesLines,
} from './types.js';

/** The flag of a row kept for assignment only, never weighed as evidence (types.ts Catalog.faint). */
export const FAINT_FLAG = 'faint';

export const CATALOG_COLUMNS = [
  'species',
  'vacuum_nm',
  'air_nm',
  'unc_nm',
  'intensity',
  'flags',
  'source',
  'origin',
];

interface Row {
  species: string;
  vacuum_nm: number;
  air_nm: number;
  unc_nm: number;
  intensity: number;
  flags: string[];
  source: string;
  origin: LineOrigin;
  where: string;
}

export interface CatalogInput {
  version: string;
  lineFiles: CatalogFile[];
  /** The bundled sources.yaml first, then any the project adds for its own lists. */
  sourceFiles: CatalogFile[];
  groupsYaml: CatalogFile | null;
  /** data/priors.yaml (species priors by source), when present. */
  priorsYaml?: CatalogFile | null;
  /** data/lines/conditions.tsv (line strengths by condition), when present. */
  conditionFiles?: CatalogFile[];
}

export function catalogSha256(input: CatalogInput): string {
  const hash = createHash('sha256');
  const files = [...input.lineFiles, ...(input.conditionFiles ?? [])].sort((a, b) =>
    a.name < b.name ? -1 : 1,
  );
  for (const f of [...files, ...input.sourceFiles]) hash.update(`${f.name}\n`).update(f.text);
  return hash.digest('hex');
}

export function parseCatalog(input: CatalogInput): Outcome<Catalog> {
  const diagnostics: Diagnostic[] = [];
  const problem = (file: string, line: number, col: number, field: string, message: string) =>
    diagnostics.push({ file, line, col, severity: 'error', code: 'catalog', field, message });

  const sources = new Map<string, SourceCitation>();
  for (const file of input.sourceFiles) {
    for (const [key, citation] of parseSources(file, problem)) {
      if (sources.has(key)) problem(file.name, 1, 1, key, `source key "${key}" is defined twice`);
      else sources.set(key, citation);
    }
  }
  const rows: Row[] = [];
  for (const file of input.lineFiles) rows.push(...parseLineFile(file, sources, problem));

  const bySpecies = new Map<string, Row[]>();
  const faintBySpecies = new Map<string, Row[]>();
  for (const row of rows) {
    const into = row.flags.includes(FAINT_FLAG) ? faintBySpecies : bySpecies;
    const list = into.get(row.species) ?? [];
    list.push(row);
    into.set(row.species, list);
  }
  for (const list of [...bySpecies.values(), ...faintBySpecies.values()])
    list.sort((a, b) => a.vacuum_nm - b.vacuum_nm);
  const conditionRows: ConditionRow[] = [];
  for (const file of input.conditionFiles ?? [])
    conditionRows.push(...parseConditionFile(file, sources, problem));
  const strengths = joinConditions(
    conditionRows,
    (name) => {
      const list = bySpecies.get(name);
      return list ? Float64Array.from(list, (r) => r.vacuum_nm) : undefined;
    },
    problem,
  );
  const linesOf = (name: string, list: readonly Row[], byCondition: SpeciesLines['strengths']) => ({
    species: name,
    vacuum_nm: Float64Array.from(list, (r) => r.vacuum_nm),
    air_nm: Float64Array.from(list, (r) => r.air_nm),
    unc_nm: Float64Array.from(list, (r) => r.unc_nm),
    intensity: Float64Array.from(list, (r) => r.intensity),
    flags: list.map((r) => r.flags),
    source: list.map((r) => r.source),
    origin: list.map((r) => r.origin),
    row: list.map((r) => r.where),
    strengths: byCondition,
  });
  const species = new Map<string, SpeciesLines>();
  for (const [name, list] of bySpecies)
    species.set(name, linesOf(name, list, strengths.get(name) ?? new Map()));
  const faint = new Map<string, SpeciesLines>();
  for (const [name, list] of faintBySpecies) faint.set(name, linesOf(name, list, new Map()));
  const names = [...species.keys()].sort();
  const { groups, defaults } = input.groupsYaml
    ? parseGroups(input.groupsYaml, species, problem)
    : { groups: new Map<string, CandidateGroup>(), defaults: new Map<string, string[]>() };
  const priors = input.priorsYaml
    ? parsePriors(input.priorsYaml, new Set(names), groups, problem)
    : EMPTY_PRIORS;

  if (diagnostics.length > 0) return { ok: false, diagnostics };
  return {
    ok: true,
    value: {
      version: input.version.trim(),
      sha256: catalogSha256(input),
      species,
      faint,
      names,
      sources,
      groups,
      defaultGroupsBySourceKind: defaults,
      priors,
    },
    warnings: [],
  };
}

type Problem = TsvProblem;

function parseLineFile(
  file: CatalogFile,
  sources: ReadonlyMap<string, SourceCitation>,
  problem: Problem,
): Row[] {
  const rows: Row[] = [];
  eachTsvRow(file, CATALOG_COLUMNS, problem, ({ cells, line: lineNo, col }) => {
    const [species, vac, air, unc, intensity, flags, source, origin] = cells as [
      string,
      string,
      string,
      string,
      string,
      string,
      string,
      string,
    ];
    const num = (s: string, k: number, field: string, allowDash = false): number => {
      if (allowDash && s === '-') return Number.NaN;
      const v = Number(s);
      if (!/^\d+(\.\d+)?$/.test(s) || !(v > 0))
        problem(file.name, lineNo, col(k), field, `"${s}" is not a positive decimal number`);
      return v;
    };
    if (!/^\S.*\S$|^\S$/.test(species))
      problem(file.name, lineNo, 1, 'species', 'species is empty or padded');
    if (!sources.has(source))
      problem(file.name, lineNo, col(6), 'source', `source key "${source}" is not in sources.yaml`);
    if (!(LINE_ORIGINS as readonly string[]).includes(origin))
      problem(file.name, lineNo, col(7), 'origin', `origin must be ${LINE_ORIGINS.join(', ')}`);
    rows.push({
      species,
      vacuum_nm: num(vac, 1, 'vacuum_nm'),
      air_nm: num(air, 2, 'air_nm', true),
      unc_nm: unc === '0' ? 0 : num(unc, 3, 'unc_nm'),
      intensity: num(intensity, 4, 'intensity'),
      flags: flags === '-' ? [] : flags.split(','),
      source,
      origin: origin as LineOrigin,
      where: `${file.name}:${lineNo}`,
    });
  });
  return rows;
}

function parseSources(file: CatalogFile, problem: Problem): Map<string, SourceCitation> {
  const out = new Map<string, SourceCitation>();
  let data: unknown;
  try {
    data = parseYaml(file.text);
  } catch (e) {
    problem(file.name, 1, 1, '', `cannot parse: ${(e as Error).message}`);
    return out;
  }
  if (typeof data !== 'object' || data === null) return out;
  for (const [key, value] of Object.entries(
    data as Record<string, { citation?: unknown; intensity?: unknown }>,
  )) {
    if (typeof value?.citation !== 'string') {
      problem(file.name, 1, 1, key, `source "${key}" has no citation`);
      continue;
    }
    out.set(key, {
      key,
      citation: value.citation,
      intensity: typeof value.intensity === 'string' ? value.intensity : '',
    });
  }
  return out;
}

function parseGroups(
  file: CatalogFile,
  species: ReadonlyMap<string, SpeciesLines>,
  problem: Problem,
): { groups: Map<string, CandidateGroup>; defaults: Map<string, string[]> } {
  const groups = new Map<string, CandidateGroup>();
  const defaults = new Map<string, string[]>();
  let data: {
    groups?: Record<string, Partial<CandidateGroup>>;
    defaults_by_source_kind?: Record<string, string[]>;
  };
  try {
    data = parseYaml(file.text) ?? {};
  } catch (e) {
    problem(file.name, 1, 1, '', `cannot parse: ${(e as Error).message}`);
    return { groups, defaults };
  }
  for (const [id, g] of Object.entries(data.groups ?? {})) {
    const list = Array.isArray(g.species) ? g.species.map(String) : [];
    const known = list.filter((s) => species.has(s));
    // A group naming a species the catalog lacks is a slip in the data: report it, never drop it silently.
    for (const s of list)
      if (!species.has(s))
        problem(file.name, 1, 1, `groups.${id}`, `group "${id}" names "${s}", which no line list holds`);
    groups.set(id, {
      id,
      title: String(g.title ?? id),
      description: String(g.description ?? ''),
      species: known,
    });
  }
  for (const [kind, ids] of Object.entries(data.defaults_by_source_kind ?? {})) {
    defaults.set(
      kind,
      (ids ?? []).filter((id) => groups.has(id)),
    );
  }
  return { groups, defaults };
}
