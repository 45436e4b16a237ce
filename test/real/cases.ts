/**
 * The real-observation cases (test/real/cases/*.yaml): reading them, the dev/held-out split and
 * the species notation. Shared by the benchmark (scripts/bench-real.ts) and the format test
 * (test/real/cases.test.ts). Disk is touched only in loadCases.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parse, stringify } from 'yaml';

export const CASES_DIR = join(dirname(fileURLToPath(import.meta.url)), 'cases');

export type Half = 'dev' | 'heldout';

/** One published line's species: one name, several acceptable names (a blend), or null (unidentified). */
export type ExpectedEntry = string | string[] | null;

export interface RealCase {
  file: string;
  case: string;
  half: Half;
  category: string;
  citation: string;
  origin: 'read' | 'memory';
  note: string;
  expected: ExpectedEntry[];
  /** The session as the YAML text lineledger reads. */
  sessionText: string;
  /** Number of lines in the session. */
  lineCount: number;
  /** Each session line's wavelength as written (null where the line gives none), for tables. */
  wavelengths: (number | null)[];
}

/**
 * The split rule, fixed before any case was run: held-out when the first byte of
 * sha256(case id) is odd, else development.
 */
export function halfFor(caseId: string): Half {
  const first = createHash('sha256').update(caseId, 'utf8').digest()[0] ?? 0;
  return first % 2 === 1 ? 'heldout' : 'dev';
}

/**
 * Published notation to catalog species: brackets of forbidden ("[O III]") and semi-forbidden
 * ("C III]") lines are dropped, because the catalog names the species "O III" and flags the line.
 */
export function normalizeSpecies(name: string): string {
  return name.replace(/[[\]]/g, '').replace(/\s+/g, ' ').trim();
}

/** The acceptable catalog species for one published line (empty = published as unidentified). */
export function acceptable(entry: ExpectedEntry): string[] {
  if (entry === null) return [];
  return (Array.isArray(entry) ? entry : [entry]).map(normalizeSpecies);
}

export interface CaseProblem {
  file: string;
  message: string;
}

function isRecord(x: unknown): x is Record<string, unknown> {
  return typeof x === 'object' && x !== null && !Array.isArray(x);
}

function isEntry(x: unknown): x is ExpectedEntry {
  return (
    x === null ||
    (typeof x === 'string' && x.trim() !== '') ||
    (Array.isArray(x) && x.length > 0 && x.every((s) => typeof s === 'string' && s.trim() !== ''))
  );
}

/** Parse one case file's text; problems are returned, never thrown. */
export function parseCase(file: string, text: string): { value: RealCase | null; problems: CaseProblem[] } {
  const problems: CaseProblem[] = [];
  const bad = (message: string) => problems.push({ file, message });
  let doc: unknown;
  try {
    doc = parse(text);
  } catch (e) {
    bad(`not YAML: ${(e as Error).message}`);
    return { value: null, problems };
  }
  if (!isRecord(doc)) {
    bad('not a mapping');
    return { value: null, problems };
  }
  const str = (key: string): string => {
    const v = doc[key];
    if (typeof v !== 'string' || v.trim() === '') {
      bad(`${key} is missing or not text`);
      return '';
    }
    return v;
  };
  const id = str('case');
  const half = str('half');
  const category = str('category');
  const citation = str('citation');
  const origin = str('origin');
  const note = str('note');
  const expectedRaw = doc.expected;
  const session = doc.session;
  if (half !== 'dev' && half !== 'heldout') bad(`half must be dev or heldout, not ${half}`);
  if (origin !== 'read' && origin !== 'memory') bad(`origin must be read or memory, not ${origin}`);
  if (!Array.isArray(expectedRaw) || !expectedRaw.every(isEntry)) {
    bad('expected must be a list of species, lists of species or null');
  }
  if (!isRecord(session) || !Array.isArray(session.lines)) {
    bad('session must be a mapping with lines');
    return { value: null, problems };
  }
  const expected = (Array.isArray(expectedRaw) ? expectedRaw : []) as ExpectedEntry[];
  if (problems.length > 0) return { value: null, problems };
  return {
    value: {
      file,
      case: id,
      half: half as Half,
      category,
      citation,
      origin: origin as 'read' | 'memory',
      note,
      expected,
      sessionText: stringify(session),
      lineCount: session.lines.length,
      wavelengths: session.lines.map((l: unknown) =>
        isRecord(l) && typeof l.wavelength === 'number' ? l.wavelength : null,
      ),
    },
    problems,
  };
}

/** Every case file, sorted by name. */
export function loadCases(dir: string = CASES_DIR): { cases: RealCase[]; problems: CaseProblem[] } {
  const cases: RealCase[] = [];
  const problems: CaseProblem[] = [];
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.yaml'))
    .sort();
  for (const f of files) {
    const r = parseCase(f, readFileSync(join(dir, f), 'utf8'));
    problems.push(...r.problems);
    if (r.value) cases.push(r.value);
  }
  return { cases, problems };
}
