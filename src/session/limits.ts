/**
 * Hard limits on what a session file may hold, and the checks that enforce them on the
 * parsed YAML before any of it is turned into data. A session is a few dozen lines written
 * by hand; the limits are far above that and exist so that a hostile or broken file (an
 * alias bomb, runaway nesting, a generated dump) is refused quickly, at a position, with
 * a message that says what was too much, what the limit is and what to do.
 */
import { type Alias, isAlias, isMap, isPair, isScalar, isSeq, type Node } from 'yaml';
import type { Diagnostic, SourcePosition } from '../diagnostics.js';

import { isReservedId, SESSION_LIMITS, type SessionLimits } from './limitValues.js';

export { isReservedId, SESSION_LIMITS, type SessionLimits };

/**
 * Depth of `[` / `{` nesting at which the text is refused before parsing. The parser
 * recurses per level and slows to tens of seconds on a file of nothing but `[`; the exact
 * depth limit is checked on the parsed tree, this cheap scan only stops the pathological
 * case early. It skips quoted strings and comments, and allows five times the depth limit
 * so that brackets inside plain text can never trip it.
 */
export function excessiveFlowNesting(text: string, maxDepth: number): number {
  const limit = 5 * maxDepth;
  let depth = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '[' || c === '{') {
      depth++;
      if (depth > limit) return i;
    } else if (c === ']' || c === '}') {
      depth = Math.max(0, depth - 1);
    } else if (c === '"' || c === "'") {
      const end = text.indexOf(c, i + 1);
      if (end < 0) return -1;
      i = end;
    } else if (c === '#' && (i === 0 || /\s/.test(text[i - 1]!))) {
      const end = text.indexOf('\n', i);
      if (end < 0) return -1;
      i = end;
    }
  }
  return -1;
}

type At = (offset: number) => SourcePosition;

function problem(
  file: string,
  position: SourcePosition,
  code: string,
  message: string,
  hint: string,
): Diagnostic {
  return { file, ...position, severity: 'error', code, field: '', message, hint };
}

function startOf(node: unknown, at: At): SourcePosition {
  const range = (node as Node | null | undefined)?.range;
  return range ? at(range[0]) : { line: 1, col: 1 };
}

function childrenOf(node: unknown): unknown[] {
  if (isPair(node)) return [node.key, node.value];
  if (isMap(node) || isSeq(node)) return node.items;
  return [];
}

/**
 * Depth, duplicate keys, alias uses and alias expansion of a parsed document, checked
 * without recursion over the document itself (the depth is not yet known to be small) and
 * without expanding anything. `resolve` finds the node an alias points at (the `yaml`
 * Document does it). Duplicate keys are found here, with one set per mapping, because the
 * parser's own check compares every key with every other and takes minutes on a file of
 * many keys.
 */
export function checkYamlStructure(
  root: unknown,
  resolve: (alias: Alias) => unknown,
  at: At,
  file: string,
  limits: Pick<SessionLimits, 'maxAliasCount' | 'maxDepth' | 'maxExpandedValues' | 'maxKeys' | 'maxLines'>,
): Diagnostic[] {
  const tooManyLines = checkLineCount(root, at, file, limits.maxLines);
  if (tooManyLines.length > 0) return tooManyLines;
  const aliases: Alias[] = [];
  const duplicates: Diagnostic[] = [];
  const stack: { node: unknown; depth: number }[] = [{ node: root, depth: 0 }];
  while (stack.length > 0) {
    const { node, depth } = stack.pop()!;
    if (isAlias(node)) aliases.push(node);
    const level = isMap(node) || isSeq(node) ? depth + 1 : depth;
    if (level > limits.maxDepth) {
      return [
        problem(
          file,
          startOf(node, at),
          'too-deep',
          `the data is nested more than ${limits.maxDepth} levels deep here; the limit is ${limits.maxDepth}`,
          'a session needs only a few levels: look for unclosed brackets or runaway indentation',
        ),
      ];
    }
    // Sizes first: every later step (and the schema's per-key messages) is at least linear in them.
    if (isMap(node) && node.items.length > limits.maxKeys)
      return [
        problem(
          file,
          startOf(node, at),
          'too-many-keys',
          `this mapping has ${node.items.length} keys; the limit is ${limits.maxKeys}`,
          'a session mapping has at most a few dozen keys: check that this is a session file',
        ),
      ];
    if (isSeq(node) && node.items.length > limits.maxLines)
      return [
        problem(
          file,
          startOf(node, at),
          'too-many-items',
          `this list has ${node.items.length} entries; the limit is ${limits.maxLines}`,
          'split the measurement into several sessions (one per source or per night)',
        ),
      ];
    if (isMap(node)) duplicates.push(...duplicateKeys(node.items, at, file));
    for (const child of childrenOf(node)) stack.push({ node: child, depth: level });
  }
  if (duplicates.length > 0) return duplicates.sort((a, b) => a.line - b.line || a.col - b.col);
  if (aliases.length === 0) return [];
  aliases.sort((a, b) => (a.range?.[0] ?? 0) - (b.range?.[0] ?? 0));
  if (aliases.length > limits.maxAliasCount) {
    const first = aliases[limits.maxAliasCount]!;
    return [
      problem(
        file,
        startOf(first, at),
        'yaml-aliases',
        `this file uses ${aliases.length} YAML aliases (*name); the limit is ${limits.maxAliasCount}`,
        'write the values out instead of repeating them through aliases',
      ),
    ];
  }
  return checkExpansion(aliases, resolve, at, file, limits.maxExpandedValues);
}

/** Too many `lines:` entries, said plainly, at the `lines` key. */
function checkLineCount(root: unknown, at: At, file: string, maxLines: number): Diagnostic[] {
  if (!isMap(root)) return [];
  const pair = root.items.find((p) => isPair(p) && isScalar(p.key) && p.key.value === 'lines');
  if (!pair || !isSeq(pair.value) || pair.value.items.length <= maxLines) return [];
  return [
    {
      file,
      ...startOf(pair.key, at),
      severity: 'error',
      code: 'too-many-lines',
      field: 'lines',
      message: `the session has ${pair.value.items.length} lines entries; the limit is ${maxLines}`,
      hint: 'split the measurement into several sessions (one per source or per night)',
    },
  ];
}

function duplicateKeys(pairs: readonly unknown[], at: At, file: string): Diagnostic[] {
  const seen = new Set<string>();
  const out: Diagnostic[] = [];
  for (const pair of pairs) {
    if (!isPair(pair)) continue;
    const key = isScalar(pair.key) ? String(pair.key.value) : null;
    if (key === null) continue;
    if (seen.has(key)) {
      out.push(
        problem(
          file,
          startOf(pair.key, at),
          'duplicate-key',
          `the key "${key}" appears twice in the same mapping`,
          'remove or rename one of the two keys',
        ),
      );
    }
    seen.add(key);
  }
  return out;
}

/** How many values each alias stands for once expanded; memoised, so linear in the document. */
function checkExpansion(
  aliases: Alias[],
  resolve: (alias: Alias) => unknown,
  at: At,
  file: string,
  maxValues: number,
): Diagnostic[] {
  const sizes = new Map<unknown, number>();
  const inProgress = new Set<unknown>();
  let cycleAt: Alias | null = null;
  let unresolvedAt: Alias | null = null;
  // Recursion depth is bounded: nesting ≤ maxDepth per node, and each alias on the way is
  // one of at most maxAliasCount.
  const size = (node: unknown): number => {
    const known = sizes.get(node);
    if (known !== undefined) return known;
    if (inProgress.has(node)) return Number.POSITIVE_INFINITY;
    inProgress.add(node);
    let total = 1;
    if (isAlias(node)) {
      const target = resolve(node);
      if (target === undefined || target === null) {
        unresolvedAt ??= node;
        total = 1;
      } else {
        total = size(target);
        if (total === Number.POSITIVE_INFINITY) cycleAt ??= node;
      }
    } else {
      for (const child of childrenOf(node)) {
        total += size(child);
        if (total > maxValues) break;
      }
    }
    inProgress.delete(node);
    sizes.set(node, total);
    return total;
  };
  let largest: { alias: Alias; values: number } | null = null;
  for (const alias of aliases) {
    const values = size(alias);
    if (!largest || values > largest.values) largest = { alias, values };
  }
  if (cycleAt)
    return [
      problem(
        file,
        startOf(cycleAt, at),
        'yaml-aliases',
        'this alias points at the mapping or list it is itself part of',
        'write the values out instead of using an alias',
      ),
    ];
  if (unresolvedAt)
    return [
      problem(
        file,
        startOf(unresolvedAt, at),
        'yaml-aliases',
        `the alias *${(unresolvedAt as Alias).source} has no anchor (&name) before it`,
        'define the anchor before using it, or write the value out',
      ),
    ];
  if (largest && largest.values > maxValues)
    return [
      problem(
        file,
        startOf(largest.alias, at),
        'yaml-aliases',
        `the YAML aliases here expand to more than ${maxValues} values; the limit is ${maxValues}`,
        'write the values out instead of nesting aliases inside aliases',
      ),
    ];
  return [];
}

/**
 * Bounds of a reading that could come from an optical grating (common practice, not a law):
 * below 1 nm is X-ray crystal territory, above 1 mm is radio; nothing a session records lies
 * outside. They catch a typo'd exponent (1e29, 1e-320) before it becomes a result.
 */
export const READING_BOUNDS = {
  minWavelength_nm: 1,
  maxWavelength_nm: 1e6,
  /**
   * Largest redshift accepted. The most distant galaxies with measured lines lie near z ≈ 14
   * (from memory); 20 leaves room and still stops a slip such as 1e300.
   */
  maxRedshift: 20,
} as const;
