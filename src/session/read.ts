/**
 * The read stage's pure core: file bytes → Session or diagnostics. Decoding, size limits,
 * YAML, structure limits, schema, then the semantic checks; every problem of the file
 * comes back together.
 */
import { compareDiagnostics, type Diagnostic, type Outcome, type SourcePosition } from '../diagnostics.js';
import { isReservedId, SESSION_LIMITS, type SessionLimits } from './limits.js';
import { normalizeSession, sessionIdFromFileName } from './normalize.js';
import { attachProfile } from './profile/attach.js';
import type { ProfileInput } from './profile/types.js';
import { overlaps, pruneProblems } from './prune.js';
import type { InstrumentSpec, Session } from './types.js';
import { isSessionDocument, validateDocument } from './validate.js';
import { parseFieldName, parseYamlSource, type YamlSource } from './yamlSource.js';

export type ReadLimits = SessionLimits;

export const DEFAULT_READ_LIMITS: ReadLimits = SESSION_LIMITS;

export interface ReadOptions {
  /** Any limit left out keeps its default (src/session/limits.ts). */
  limits?: Partial<ReadLimits>;
  /** The project's default instrument (lineledger.yaml), used where the session gives none. */
  instrumentDefaults?: InstrumentSpec | null;
  /** The profile file the session names, as the edge read it (see profileFileOf). */
  profile?: ProfileInput | null;
}

/** The default id for a file name: safe as a folder name on every system (`con` → `con-session`). */
export function safeIdFromFileName(fileName: string): string {
  const id = sessionIdFromFileName(fileName);
  return isReservedId(id) ? `${id}-session` : id;
}

function fileProblem(
  file: string,
  code: string,
  message: string,
  hint: string,
  position: SourcePosition = { line: 1, col: 1 },
): Diagnostic {
  return { file, ...position, severity: 'error', code, field: '', message, hint };
}

/** Line and column (1-based, in characters) of a character offset. */
function positionInText(text: string, offset: number): SourcePosition {
  const before = text.slice(0, offset).split('\n');
  return { line: before.length, col: (before.at(-1)?.length ?? 0) + 1 };
}

/** Byte offset of the first byte that does not start or continue a valid UTF-8 sequence. */
function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i]!;
    // Sequence length and the allowed range of the second byte (no overlongs, no surrogates).
    let n = 0;
    let lo = 0x80;
    let hi = 0xbf;
    if (b < 0x80) n = 1;
    else if (b >= 0xc2 && b <= 0xdf) n = 2;
    else if (b >= 0xe0 && b <= 0xef) {
      n = 3;
      if (b === 0xe0) lo = 0xa0;
      if (b === 0xed) hi = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      n = 4;
      if (b === 0xf0) lo = 0x90;
      if (b === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k < n; k++) {
      const c = bytes[i + k];
      const [min, max] = k === 1 ? [lo, hi] : [0x80, 0xbf];
      if (c === undefined || c < min || c > max) return i;
    }
    i += n;
  }
  return bytes.length;
}

function decode(bytes: Uint8Array, file: string): { text: string } | { diagnostic: Diagnostic } {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    return {
      diagnostic: fileProblem(
        file,
        'not-utf8',
        'the file is saved as UTF-16 text; session files must be UTF-8',
        'save it again with the encoding set to UTF-8',
      ),
    };
  }
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes) };
  } catch {
    const bad = firstInvalidUtf8(bytes);
    const lossy = new TextDecoder('utf-8').decode(bytes.subarray(0, bad));
    return {
      diagnostic: fileProblem(
        file,
        'not-utf8',
        `the file is not valid UTF-8 text: byte 0x${bytes[bad]?.toString(16).padStart(2, '0') ?? '??'} here is not UTF-8`,
        'save it as UTF-8 (it was probably saved in a legacy encoding such as Latin-1 or Windows-1252)',
        positionInText(lossy.replace(/^\ufeff/, ''), lossy.replace(/^\ufeff/, '').length),
      ),
    };
  }
}

function valueAt(data: unknown, field: string): unknown {
  let node = data;
  for (const part of parseFieldName(field)) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string | number, unknown>)[part];
  }
  return node;
}

/**
 * Schema messages made plain where the validator's own words are terse: an empty value
 * (what a scaffold leaves for the user), and a text or list over its length limit.
 */
function clarify(d: Diagnostic, source: YamlSource): Diagnostic {
  if (d.code !== 'invalid-value' || !d.field) return d;
  const value = valueAt(source.data, d.field);
  if (value === null)
    return {
      ...d,
      code: 'empty-value',
      message: 'has no value',
      hint: 'write a value after the colon (the comment on the line says what goes there), or delete the line if it is optional',
    };
  const chars = /^must NOT have more than (\d+) characters$/.exec(d.message);
  if (chars && typeof value === 'string')
    return {
      ...d,
      code: 'too-long',
      message: `is ${[...value].length} characters long; the limit is ${chars[1]}`,
      hint: d.field === 'notes' ? 'shorten the notes' : 'shorten it; longer text belongs in notes:',
    };
  const items = /^must NOT have more than (\d+) items$/.exec(d.message);
  if (items && Array.isArray(value))
    return {
      ...d,
      code: 'too-many-items',
      message: `has ${value.length} entries; the limit is ${items[1]}`,
      hint: 'remove entries, or split the session',
    };
  return d;
}

/** One message per field and kind: an empty word-list value fails both its type and its list. */
function unique(diagnostics: Diagnostic[]): Diagnostic[] {
  const seen = new Set<string>();
  return diagnostics.filter((d) => {
    const key = `${d.line}:${d.col}:${d.code}:${d.field}:${d.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
}

export function readSessionText(
  bytes: Uint8Array | string,
  file: string,
  options: ReadOptions = {},
): Outcome<Session> {
  const limits: ReadLimits = { ...SESSION_LIMITS, ...options.limits };
  const size = typeof bytes === 'string' ? Buffer.byteLength(bytes) : bytes.byteLength;
  if (size > limits.maxBytes) {
    return {
      ok: false,
      diagnostics: [
        fileProblem(
          file,
          'file-too-large',
          `the file is ${size} bytes; the limit is ${limits.maxBytes} bytes`,
          'a session is a few kilobytes: split it into several sessions, or move long notes elsewhere',
        ),
      ],
    };
  }
  let text: string;
  if (typeof bytes === 'string') {
    text = bytes;
  } else {
    const decoded = decode(bytes, file);
    if ('diagnostic' in decoded) return { ok: false, diagnostics: [decoded.diagnostic] };
    text = decoded.text;
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // a byte-order mark is harmless: drop it
  const nul = text.indexOf('\u0000');
  if (nul >= 0) {
    return {
      ok: false,
      diagnostics: [
        fileProblem(
          file,
          'binary-content',
          'the file holds a NUL byte: it is not a text file',
          'check that this is a session YAML file',
          positionInText(text, nul),
        ),
      ],
    };
  }

  const parsed = parseYamlSource(text, file, limits);
  if (!parsed.source) return { ok: false, diagnostics: parsed.diagnostics };
  const source = parsed.source;
  if (source.data === null || source.data === undefined)
    return {
      ok: false,
      diagnostics: [
        fileProblem(
          file,
          'empty-file',
          'the file holds no session (it is empty or only comments)',
          'start with `lineledger: 1` and a lines: list, or create a template with `lineledger new FILE`',
        ),
      ],
    };
  const validated = validateDocument(source, file);
  const errors = unique(validated.diagnostics.map((d) => clarify(d, source)));
  // With schema problems, the semantic checks still look at the rest of the file (prune.ts),
  // so that an unknown key does not hide a wrong date or an impossible reading.
  let document = validated.document;
  let removed: string[] = [];
  if (!document) {
    const rest = validated.problemPaths && pruneProblems(source.data, validated.problemPaths);
    if (!rest || !isSessionDocument(rest.data)) return { ok: false, diagnostics: errors };
    document = rest.data;
    removed = rest.removed;
  }
  if (document.id !== undefined && isReservedId(document.id))
    errors.push({
      file,
      ...source.positionOf(['id']),
      severity: 'error',
      code: 'reserved-id',
      field: 'id',
      message: `"${document.id}" is a device name on Windows and cannot be a folder name there`,
      hint: `choose another id, such as ${document.id}-1`,
    });
  const named = document.id === undefined ? { ...document, id: safeIdFromFileName(file) } : document;
  const normalized = normalizeSession(named, source, file, bytes, options.instrumentDefaults ?? null);
  if (errors.length > 0 || !normalized.session) {
    // A check of a field that was taken out (or of what holds it) would only repeat its problem.
    const more = normalized.diagnostics.filter((d) => !removed.some((f) => overlaps(d.field, f)));
    const all =
      errors.length > 0 && more.length > 0
        ? [...errors, ...more].sort(compareDiagnostics)
        : [...errors, ...more];
    return { ok: false, diagnostics: all };
  }
  const warnings = [...normalized.diagnostics];
  let session = normalized.session;
  if (document.profile !== undefined) {
    const attached = attachProfile(
      session,
      { ...document, profile: document.profile },
      source,
      options.profile,
    );
    if (!attached.session) return { ok: false, diagnostics: attached.diagnostics };
    session = attached.session;
    warnings.push(...attached.diagnostics);
  }
  // A name without a letter or digit an id can hold: the id is made up, so say which.
  if (document.id === undefined && /^session-[0-9a-f]{8}$/.test(named.id ?? ''))
    warnings.unshift({
      file,
      line: 1,
      col: 1,
      severity: 'warning',
      code: 'default-id',
      field: 'id',
      message: `the file name has no letters or digits an id can hold, so this session's id is ${named.id}`,
      hint: `add id: ${named.id} (or one of your own) to keep it`,
    });
  return { ok: true, value: session, warnings };
}
