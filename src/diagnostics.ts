/**
 * Problems are values, not thrown strings: every stage returns them, the CLI prints them
 * together, and the build keeps going for the other sessions.
 */

export type Severity = 'error' | 'warning';

export interface SourcePosition {
  /** 1-based line and column in the source file. */
  line: number;
  col: number;
}

export interface Diagnostic extends SourcePosition {
  file: string;
  severity: Severity;
  /** Stable machine-readable code, e.g. `unknown-key`. */
  code: string;
  /** Dotted path of the field the problem is about, e.g. `lines[2].wavelength`. */
  field: string;
  message: string;
  /** What to do about it. */
  hint?: string;
}

export type Outcome<T> =
  | { ok: true; value: T; warnings: Diagnostic[] }
  | { ok: false; diagnostics: Diagnostic[] };

export function compareDiagnostics(a: Diagnostic, b: Diagnostic): number {
  return a.file.localeCompare(b.file) || a.line - b.line || a.col - b.col || a.code.localeCompare(b.code);
}

/**
 * Control characters (C0, DEL, C1), line and paragraph separators and bidirectional overrides
 * made visible as escapes: a session's text never moves the cursor, retitles the terminal or
 * reorders what is shown. Tabs stay (they are plain layout).
 */
// biome-ignore lint/suspicious/noControlCharactersInRegex: finding them is the point.
const CONTROL = /[\u0000-\u0008\u000a-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;

export function escapeControls(text: string): string {
  return text.replace(CONTROL, (c) => {
    const code = c.charCodeAt(0);
    if (c === '\n') return '\\n';
    if (c === '\r') return '\\r';
    return code <= 0xff
      ? `\\x${code.toString(16).padStart(2, '0')}`
      : `\\u${code.toString(16).padStart(4, '0')}`;
  });
}

/** One line per problem, compiler style: `file:line:col: error[code] field: message (hint)`. */
export function formatDiagnosticLine(d: Diagnostic): string {
  const hint = d.hint ? ` — ${d.hint}` : '';
  const field = d.field ? `${d.field}: ` : '';
  return escapeControls(`${d.file}:${d.line}:${d.col}: ${d.severity}[${d.code}] ${field}${d.message}${hint}`);
}

function withSourceLine(d: Diagnostic, lines: readonly string[] | undefined): string {
  const head = formatDiagnosticLine(d);
  const text = lines?.[d.line - 1];
  if (text === undefined) return head;
  const gutter = String(d.line);
  const pad = ' '.repeat(gutter.length);
  // The caret counts the escaped characters before it, as they are shown.
  const caretPad = escapeControls(text.slice(0, Math.max(0, d.col - 1))).replace(/[^\t]/g, ' ');
  return `${head}\n ${gutter} | ${escapeControls(text)}\n ${pad} | ${caretPad}^`;
}

/** Compiler-style block with the offending source line and a caret under the column. */
export function formatDiagnosticWithSource(d: Diagnostic, sourceText: string | undefined): string {
  return withSourceLine(d, sourceText?.split(/\r?\n/));
}

/** How many problems of one file are printed in full before the rest are counted. */
export const PRINTED_PER_FILE = 100;

/**
 * Many problems of one source, in linear time: the text is split into lines once, and after
 * `limit` problems the rest are summed up in one line.
 */
export function formatDiagnosticsWithSource(
  diagnostics: readonly Diagnostic[],
  sourceText: string | undefined,
  limit: number = PRINTED_PER_FILE,
): string[] {
  const lines = sourceText?.split(/\r?\n/);
  const shown = diagnostics.slice(0, limit).map((d) => withSourceLine(d, lines));
  const rest = diagnostics.length - shown.length;
  if (rest > 0) {
    const file = escapeControls(diagnostics[0]?.file ?? '');
    shown.push(
      `${file}: … and ${rest.toLocaleString('en-US')} more problem${rest === 1 ? '' : 's'} (lineledger vet --format json ${file} lists them all)`,
    );
  }
  return shown;
}
