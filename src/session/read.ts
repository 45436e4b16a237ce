/**
 * The read stage's pure core: file bytes → Session or diagnostics. Decoding, size limits,
 * YAML, schema, then the semantic checks; every problem of the file comes back together.
 */
import type { Diagnostic, Outcome } from '../diagnostics.js';
import { normalizeSession } from './normalize.js';
import type { InstrumentSpec, Session } from './types.js';
import { validateDocument } from './validate.js';
import { parseYamlSource } from './yamlSource.js';

export interface ReadLimits {
  maxBytes: number;
  maxAliasCount: number;
}

export const DEFAULT_READ_LIMITS: ReadLimits = { maxBytes: 2 * 1024 * 1024, maxAliasCount: 50 };

export interface ReadOptions {
  limits?: ReadLimits;
  /** The project's default instrument (lineledger.yaml), used where the session gives none. */
  instrumentDefaults?: InstrumentSpec | null;
}

function fileProblem(
  file: string,
  code: string,
  message: string,
  hint: string,
  line = 1,
  col = 1,
): Diagnostic {
  return { file, line, col, severity: 'error', code, field: '', message, hint };
}

export function readSessionText(
  bytes: Uint8Array | string,
  file: string,
  options: ReadOptions = {},
): Outcome<Session> {
  const limits = options.limits ?? DEFAULT_READ_LIMITS;
  const size = typeof bytes === 'string' ? Buffer.byteLength(bytes) : bytes.byteLength;
  if (size > limits.maxBytes) {
    return {
      ok: false,
      diagnostics: [
        fileProblem(
          file,
          'file-too-large',
          `the file is ${size} bytes; the limit is ${limits.maxBytes}`,
          'split the session or trim it',
        ),
      ],
    };
  }
  let text: string;
  if (typeof bytes === 'string') {
    text = bytes;
  } else {
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      return {
        ok: false,
        diagnostics: [fileProblem(file, 'not-utf8', 'the file is not valid UTF-8 text', 'save it as UTF-8')],
      };
    }
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // a byte-order mark is harmless: drop it
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    const before = text.slice(0, nul).split('\n');
    return {
      ok: false,
      diagnostics: [
        fileProblem(
          file,
          'binary-content',
          'the file holds a NUL byte: it is not a text file',
          'check that this is a session YAML file',
          before.length,
          (before.at(-1)?.length ?? 0) + 1,
        ),
      ],
    };
  }

  const parsed = parseYamlSource(text, file, { maxAliasCount: limits.maxAliasCount });
  if (!parsed.source) return { ok: false, diagnostics: parsed.diagnostics };
  const validated = validateDocument(parsed.source, file);
  if (!validated.document) return { ok: false, diagnostics: validated.diagnostics };
  const normalized = normalizeSession(
    validated.document,
    parsed.source,
    file,
    bytes,
    options.instrumentDefaults ?? null,
  );
  if (!normalized.session) return { ok: false, diagnostics: normalized.diagnostics };
  return { ok: true, value: normalized.session, warnings: normalized.diagnostics };
}
