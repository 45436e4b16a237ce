/**
 * YAML text → plain data plus a way to find where any field sits in the file.
 * We use the `yaml` package because it keeps a concrete syntax tree with source ranges,
 * reports every syntax error with its offset, and caps alias expansion.
 */
import { isMap, isPair, isScalar, isSeq, LineCounter, type Node, parseDocument } from 'yaml';
import type { Diagnostic, SourcePosition } from '../diagnostics.js';

export type FieldPath = readonly (string | number)[];

export interface YamlSource {
  data: unknown;
  /** Position of the value at `path` (or of its key when `key` is true); nearest ancestor if absent. */
  positionOf(path: FieldPath, key?: boolean): SourcePosition;
}

export interface YamlLimits {
  maxAliasCount: number;
}

export const DEFAULT_YAML_LIMITS: YamlLimits = { maxAliasCount: 50 };

export function fieldName(path: FieldPath): string {
  let out = '';
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`;
    else out += out ? `.${part}` : part;
  }
  return out;
}

export function parseYamlSource(
  text: string,
  file: string,
  limits: YamlLimits = DEFAULT_YAML_LIMITS,
): { source: YamlSource | null; diagnostics: Diagnostic[] } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, uniqueKeys: true, prettyErrors: false, strict: true });
  const at = (offset: number): SourcePosition => {
    const p = lineCounter.linePos(Math.max(0, Math.min(offset, text.length)));
    return { line: p.line, col: p.col };
  };
  const diagnostics: Diagnostic[] = [];
  for (const err of doc.errors) {
    const pos = at(err.pos[0]);
    const duplicate = err.code === 'DUPLICATE_KEY';
    diagnostics.push({
      file,
      ...pos,
      severity: 'error',
      code: duplicate ? 'duplicate-key' : 'yaml-syntax',
      field: '',
      message: firstLine(err.message),
      hint: duplicate ? 'remove or rename one of the two keys' : 'fix the YAML syntax at this position',
    });
  }
  if (diagnostics.length > 0) return { source: null, diagnostics };

  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: limits.maxAliasCount });
  } catch (e) {
    // The only throw left after a clean parse is the alias-expansion limit.
    diagnostics.push({
      file,
      line: 1,
      col: 1,
      severity: 'error',
      code: 'yaml-aliases',
      field: '',
      message: `too many YAML alias expansions (${firstLine(String((e as Error).message))})`,
      hint: `write the values out; at most ${limits.maxAliasCount} alias uses are allowed`,
    });
    return { source: null, diagnostics };
  }

  const positionOf = (path: FieldPath, key = false): SourcePosition => {
    let node: unknown = doc.contents;
    let best: SourcePosition = nodeStart(node, at) ?? { line: 1, col: 1 };
    for (let i = 0; i < path.length; i++) {
      const part = path[i];
      const last = i === path.length - 1;
      if (isMap(node)) {
        const pair = node.items.find(
          (p) => isPair(p) && isScalar(p.key) && String(p.key.value) === String(part),
        );
        if (!pair) return best;
        if (last && key) return nodeStart(pair.key, at) ?? best;
        node = pair.value;
        best = nodeStart(node, at) ?? nodeStart(pair.key, at) ?? best;
      } else if (isSeq(node) && typeof part === 'number') {
        const item = node.items[part];
        if (item === undefined) return best;
        node = item;
        best = nodeStart(node, at) ?? best;
      } else {
        return best;
      }
    }
    return best;
  };
  return { source: { data, positionOf }, diagnostics };
}

function nodeStart(node: unknown, at: (offset: number) => SourcePosition): SourcePosition | null {
  const range = (node as Node | null | undefined)?.range;
  return range ? at(range[0]) : null;
}

function firstLine(s: string): string {
  return s.split('\n')[0] ?? s;
}
