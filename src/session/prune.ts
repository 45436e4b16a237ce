/**
 * A document with its schema problems taken out, so that the semantic checks (normalize.ts)
 * can still look at the rest: an unknown key or one bad value should not hide a wrong date or
 * an impossible reading elsewhere in the file (every problem of a file is reported at once).
 * Pure: the parsed data is copied, never changed.
 */
import { type FieldPath, fieldName } from './yamlSource.js';

/**
 * Fields whose value the other checks depend on: with a bad one taken out, they would be judged
 * against the default (method wavelength, unit nm) and report problems the file does not have.
 */
const GOVERNING: readonly string[] = ['measurement.method', 'measurement.unit'];

/** Whether one field is the other or holds it (`lines[2]` holds `lines[2].sigma`). */
export function overlaps(a: string, b: string): boolean {
  const within = (inner: string, outer: string) =>
    inner === outer || outer === '' || inner.startsWith(`${outer}.`) || inner.startsWith(`${outer}[`);
  return within(a, b) || within(b, a);
}

/**
 * The path that is taken out for a problem at `path`: the key itself, or, inside a list, the
 * nearest key that holds the list (taking out one item would renumber the others).
 */
function removable(path: FieldPath): FieldPath {
  let p = [...path];
  while (p.length > 0 && typeof p.at(-1) === 'number') p = p.slice(0, -1);
  return p;
}

/** Deletes the key at `path` in place (the caller owns the copy); no-op when it is not there. */
function remove(data: unknown, path: FieldPath): void {
  let node = data;
  for (const part of path.slice(0, -1)) {
    if (node === null || typeof node !== 'object') return;
    node = (node as Record<string | number, unknown>)[part];
  }
  const key = path.at(-1);
  if (node !== null && typeof node === 'object' && !Array.isArray(node) && typeof key === 'string')
    delete (node as Record<string, unknown>)[key];
}

/**
 * The data without the fields at `paths`, and the names of the fields taken out; null when
 * nothing useful is left to check (a problem at the top, or on a field others depend on).
 */
export function pruneProblems(
  data: unknown,
  paths: readonly FieldPath[],
): { data: unknown; removed: string[] } | null {
  const targets = paths.map(removable);
  if (targets.some((p) => p.length === 0)) return null;
  const removed = targets.map(fieldName);
  if (removed.some((f) => GOVERNING.some((g) => overlaps(f, g)))) return null;
  // One copy, then deletions in place: linear in the problems, however many lines they are on.
  const out = structuredClone(data);
  for (const p of targets) remove(out, p);
  return { data: out, removed };
}
