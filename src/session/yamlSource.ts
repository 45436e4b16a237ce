/**
 * YAML text → plain data plus a way to find where any field sits in the file.
 * We use the `yaml` package because it keeps a concrete syntax tree with source ranges,
 * reports every syntax error with its offset, and caps alias expansion.
 */
import {
  type Document,
  isMap,
  isPair,
  isScalar,
  isSeq,
  LineCounter,
  type Node,
  parseDocument,
  visit,
  type YAMLError,
} from 'yaml';
import type { Diagnostic, SourcePosition } from '../diagnostics.js';
import { checkYamlStructure, excessiveFlowNesting, SESSION_LIMITS, type SessionLimits } from './limits.js';

export type FieldPath = readonly (string | number)[];

export interface YamlSource {
  data: unknown;
  /** Position of the value at `path` (or of its key when `key` is true); nearest ancestor if absent. */
  positionOf(path: FieldPath, key?: boolean): SourcePosition;
}

export type YamlLimits = Pick<
  SessionLimits,
  'maxAliasCount' | 'maxDepth' | 'maxExpandedValues' | 'maxKeys' | 'maxLines'
>;

export const DEFAULT_YAML_LIMITS: YamlLimits = {
  maxAliasCount: SESSION_LIMITS.maxAliasCount,
  maxDepth: SESSION_LIMITS.maxDepth,
  maxExpandedValues: SESSION_LIMITS.maxExpandedValues,
  maxKeys: SESSION_LIMITS.maxKeys,
  maxLines: SESSION_LIMITS.maxLines,
};

export function fieldName(path: FieldPath): string {
  let out = '';
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`;
    else out += out ? `.${part}` : part;
  }
  return out;
}

/** The inverse of fieldName: `lines[2].wavelength` → ['lines', 2, 'wavelength']. */
export function parseFieldName(field: string): FieldPath {
  const path: (string | number)[] = [];
  for (const m of field.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) {
    if (m[2] !== undefined) path.push(Number(m[2]));
    else if (m[1] !== undefined) path.push(m[1]);
  }
  return path;
}

export function parseYamlSource(
  text: string,
  file: string,
  limits: Partial<YamlLimits> = DEFAULT_YAML_LIMITS,
): { source: YamlSource | null; diagnostics: Diagnostic[] } {
  const limit: YamlLimits = { ...DEFAULT_YAML_LIMITS, ...limits };
  const lineCounter = new LineCounter();
  const at = (offset: number): SourcePosition => {
    const p = lineCounter.linePos(Math.max(0, Math.min(offset, text.length)));
    return { line: p.line, col: p.col };
  };
  const runaway = excessiveFlowNesting(text, limit.maxDepth);
  if (runaway >= 0) {
    lineCounter.addNewLine(0);
    for (let i = text.indexOf('\n'); i >= 0 && i < runaway; i = text.indexOf('\n', i + 1))
      lineCounter.addNewLine(i + 1);
    return { source: null, diagnostics: [tooDeep(file, at(runaway), limit.maxDepth)] };
  }
  let doc: Document.Parsed;
  try {
    // logLevel 'error': the library would otherwise print warnings to the process's stderr.
    doc = parseDocument(text, {
      lineCounter,
      uniqueKeys: false, // checked in checkYamlStructure, in linear time
      prettyErrors: false,
      strict: true,
      logLevel: 'error',
    });
  } catch (e) {
    // The parser recurses on nested flow collections; thousands of `[` exhaust the stack.
    if (!(e instanceof RangeError)) throw e;
    return { source: null, diagnostics: [tooDeep(file, { line: 1, col: 1 }, limit.maxDepth)] };
  }
  const diagnostics: Diagnostic[] = doc.errors.map((err) =>
    syntaxDiagnostic(err, text, at(err.pos[0]), file, limit),
  );
  if (diagnostics.length > 0) return { source: null, diagnostics };

  const structure = checkYamlStructure(doc.contents, (alias) => alias.resolve(doc), at, file, limit);
  if (structure.length > 0) return { source: null, diagnostics: structure };

  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: limit.maxAliasCount });
  } catch (e) {
    // Only the library's own alias guard can throw after the checks above; point at the first alias.
    let first: SourcePosition = { line: 1, col: 1 };
    visit(doc, {
      Alias(_key, node) {
        if (node.range) first = at(node.range[0]);
        return visit.BREAK;
      },
    });
    diagnostics.push({
      file,
      ...first,
      severity: 'error',
      code: 'yaml-aliases',
      field: '',
      message: `the YAML aliases in this file expand too far (${firstLine(String((e as Error).message))})`,
      hint: 'write the values out instead of repeating them through aliases',
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

function tooDeep(file: string, position: SourcePosition, maxDepth: number): Diagnostic {
  return {
    file,
    ...position,
    severity: 'error',
    code: 'too-deep',
    field: '',
    message: `the data is nested more than ${maxDepth} levels deep; the limit is ${maxDepth}`,
    hint: 'a session needs only a few levels: look for unclosed brackets or runaway indentation',
  };
}

/** The parser's errors, with the common ones said in plain words. */
function syntaxDiagnostic(
  err: YAMLError,
  text: string,
  position: SourcePosition,
  file: string,
  limit: YamlLimits,
): Diagnostic {
  const base = { file, ...position, severity: 'error' as const, field: '' };
  if (err.code === 'DUPLICATE_KEY') {
    const key = /^[^\s:,{}[\]]+|^"[^"\n]*"|^'[^'\n]*'/.exec(text.slice(err.pos[0]))?.[0];
    return {
      ...base,
      code: 'duplicate-key',
      message: key
        ? `the key ${key} appears twice in the same mapping`
        : 'a key appears twice in the same mapping',
      hint: 'remove or rename one of the two keys',
    };
  }
  if (err.code === 'TAB_AS_INDENT')
    return {
      ...base,
      code: 'tab-indent',
      message: 'a tab is used for indentation here; YAML allows only spaces for indentation',
      hint: 'replace the tab with spaces (set your editor to insert spaces for the Tab key)',
    };
  if (err.code === 'MULTIPLE_DOCS')
    return {
      ...base,
      code: 'multiple-documents',
      message: 'a second YAML document starts here (after a line "---" or "...")',
      hint: 'one session per file: remove the separator, or move the second session into its own file',
    };
  if (/call stack/i.test(err.message)) return tooDeep(file, position, limit.maxDepth);
  return {
    ...base,
    code: 'yaml-syntax',
    message: firstLine(err.message),
    hint: 'fix the YAML syntax at this position',
  };
}

function firstLine(s: string): string {
  return s.split('\n')[0] ?? s;
}
