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

/** One line per problem, compiler style: `file:line:col: error[code] field: message (hint)`. */
export function formatDiagnosticLine(d: Diagnostic): string {
  const hint = d.hint ? ` — ${d.hint}` : '';
  const field = d.field ? `${d.field}: ` : '';
  return `${d.file}:${d.line}:${d.col}: ${d.severity}[${d.code}] ${field}${d.message}${hint}`;
}

/** Compiler-style block with the offending source line and a caret under the column. */
export function formatDiagnosticWithSource(d: Diagnostic, sourceText: string | undefined): string {
  const head = formatDiagnosticLine(d);
  if (sourceText === undefined) return head;
  const lines = sourceText.split(/\r?\n/);
  const text = lines[d.line - 1];
  if (text === undefined) return head;
  const gutter = String(d.line);
  const pad = ' '.repeat(gutter.length);
  const caretPad = text.slice(0, Math.max(0, d.col - 1)).replace(/[^\t]/g, ' ');
  return `${head}\n ${gutter} | ${text}\n ${pad} | ${caretPad}^`;
}
