/**
 * data/priors.yaml → SourcePriors: prior probabilities of species by source kind and class,
 * list defaults and which intensities to trust. Pure: the file's text comes in, problems go
 * out as diagnostics (each at the entry's line and column).
 */
import { isMap, isScalar, isSeq, LineCounter, parseDocument, type YAMLMap } from 'yaml';
import {
  type CandidateGroup,
  type CatalogFile,
  type IntensityCondition,
  LINE_CONDITIONS,
  type PriorEntry,
  type SourcePriorSet,
  type SourcePriors,
} from './types.js';

type Problem = (file: string, line: number, col: number, field: string, message: string) => void;

export const EMPTY_PRIORS: SourcePriors = { kinds: new Map(), classes: new Map() };

/** Beyond this a line is not a line of the species (a few thousand km/s is a broad line's whole width). */
const MAX_LINE_SCATTER_KM_S = 3000;
const LISTED = new Set(['all-seen', 'selection']);
const TRUST = new Set(['trust', 'distrust']);
const INTENSITIES: ReadonlySet<string> = new Set<IntensityCondition>(['lab', ...LINE_CONDITIONS]);

export function parsePriors(
  file: CatalogFile,
  speciesNames: ReadonlySet<string>,
  groups: ReadonlyMap<string, CandidateGroup>,
  problem: Problem,
): SourcePriors {
  const counter = new LineCounter();
  const doc = parseDocument(file.text, { lineCounter: counter });
  const at = (node: unknown) => {
    const range = (node as { range?: [number, number, number] } | null)?.range;
    const pos = counter.linePos(range?.[0] ?? 0);
    return [pos.line, pos.col] as const;
  };
  const fail = (node: unknown, field: string, message: string) => {
    const [line, col] = at(node);
    problem(file.name, line, col, field, message);
  };
  if (doc.errors.length > 0) {
    fail(null, '', `cannot parse: ${doc.errors[0]?.message ?? 'YAML error'}`);
    return EMPTY_PRIORS;
  }
  const root = doc.contents;
  if (!isMap(root)) return EMPTY_PRIORS;
  const section = (key: string): Map<string, SourcePriorSet> => {
    const out = new Map<string, SourcePriorSet>();
    const node = root.get(key, true);
    if (node === undefined) return out;
    if (!isMap(node)) {
      fail(node, key, `${key} must be a map`);
      return out;
    }
    for (const pair of node.items) {
      const name = isScalar(pair.key) ? String(pair.key.value) : '';
      out.set(name, parseSet(pair.value, `${key}.${name}`));
    }
    return out;
  };
  /**
   * A map `{ <valueKey>: number, reason, source }` under `key` whose number passes `ok`; null
   * when absent, and reported at its place when malformed.
   */
  const reasoned = (
    map: YAMLMap,
    key: string,
    valueKey: string,
    ok: (value: number) => boolean,
    field: string,
    expected: string,
  ): { value: number; reason: string; source: string } | null => {
    const node = map.get(key, true);
    if (node === undefined) return null;
    const get = (k: string): unknown => (isMap(node) ? node.get(k) : undefined);
    const value = get(valueKey);
    const reason = get('reason');
    const source = get('source');
    if (
      typeof value === 'number' &&
      ok(value) &&
      typeof reason === 'string' &&
      reason.trim() &&
      typeof source === 'string' &&
      source.trim()
    )
      return { value, reason, source };
    fail(node, `${field}.${key}`, expected);
    return null;
  };
  const parseSet = (node: unknown, field: string): SourcePriorSet => {
    const set: SourcePriorSet = {
      lines_listed: null,
      lab_intensities: null,
      intensities: null,
      line_scatter: null,
      others: null,
      priors: [],
    };
    if (node === null || node === undefined || (isScalar(node) && node.value === null)) return set;
    if (!isMap(node)) {
      fail(node, field, 'must be a map');
      return set;
    }
    const map = node as YAMLMap;
    const listed = map.get('lines_listed');
    if (listed !== undefined) {
      if (typeof listed === 'string' && LISTED.has(listed))
        set.lines_listed = listed as 'all-seen' | 'selection';
      else
        fail(
          map.get('lines_listed', true),
          `${field}.lines_listed`,
          'lines_listed must be all-seen or selection',
        );
    }
    const trust = map.get('lab_intensities');
    if (trust !== undefined) {
      if (typeof trust === 'string' && TRUST.has(trust)) set.lab_intensities = trust as 'trust' | 'distrust';
      else
        fail(
          map.get('lab_intensities', true),
          `${field}.lab_intensities`,
          'lab_intensities must be trust or distrust',
        );
    }
    const intensities = map.get('intensities');
    if (intensities !== undefined) {
      if (typeof intensities === 'string' && INTENSITIES.has(intensities))
        set.intensities = intensities as IntensityCondition;
      else
        fail(
          map.get('intensities', true),
          `${field}.intensities`,
          `intensities must be one of ${[...INTENSITIES].join(', ')}`,
        );
    }
    const scatter = reasoned(
      map,
      'line_scatter',
      'km_s',
      (v) => v >= 0 && v <= MAX_LINE_SCATTER_KM_S,
      field,
      `line_scatter is a map of km_s (0 to ${MAX_LINE_SCATTER_KM_S}), reason and source`,
    );
    if (scatter) set.line_scatter = { km_s: scatter.value, reason: scatter.reason, source: scatter.source };
    const others = reasoned(
      map,
      'others',
      'p',
      (v) => v > 0 && v < 1,
      field,
      'others is a map of p (between 0 and 1), reason and source',
    );
    if (others) set.others = { p: others.value, reason: others.reason, source: others.source };
    const list = map.get('priors', true);
    if (list === undefined) return set;
    if (!isSeq(list)) {
      fail(list, `${field}.priors`, 'priors must be a list');
      return set;
    }
    list.items.forEach((item, i) => {
      const where = `${field}.priors[${i}]`;
      if (!isMap(item)) {
        fail(item, where, 'each prior is a map with species or group, p, reason and source');
        return;
      }
      const species = item.get('species');
      const group = item.get('group');
      const p = item.get('p');
      const reason = item.get('reason');
      const source = item.get('source');
      if (typeof p !== 'number' || !(p > 0 && p < 1)) {
        fail(item, where, 'p must be a probability strictly between 0 and 1');
        return;
      }
      if (typeof reason !== 'string' || typeof source !== 'string' || !reason.trim() || !source.trim()) {
        fail(item, where, 'every prior needs a reason and a source ("common practice" where none)');
        return;
      }
      let members: string[];
      if (typeof species === 'string') {
        if (!speciesNames.has(species)) {
          fail(item, where, `the catalog has no species "${species}"`);
          return;
        }
        members = [species];
      } else if (typeof group === 'string') {
        const g = groups.get(group);
        if (!g) {
          fail(item, where, `there is no candidate group "${group}"`);
          return;
        }
        members = [...g.species];
      } else {
        fail(item, where, 'name a species or a group');
        return;
      }
      const entry: PriorEntry = {
        p,
        reason,
        source,
        members,
        group: typeof group === 'string' ? group : null,
      };
      set.priors.push(entry);
    });
    return set;
  };
  return { kinds: section('kinds'), classes: section('classes') };
}
