/**
 * `lineledger vet FILE|DIR...`: check sessions before they are submitted, without building.
 * Each file is read and reduced (reduction problems count too) and its candidate species
 * and groups are checked against the catalog. Exit 0 when no file has errors (warnings are
 * printed but allowed), 1 when some file has, 2 when the check could not run.
 */
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Command } from 'commander';
import { compareDiagnostics, type Diagnostic } from '../diagnostics.js';
import { candidateSpecies } from '../identify/candidates.js';
import { readProfileInput, readSessionInput } from '../input/sessionFiles.js';
import type { Catalog } from '../lines/types.js';
import { outOfRangeWarnings } from '../reduce/range.js';
import { reduceSession } from '../reduce/reduce.js';
import { profileFileOf } from '../session/profile/ref.js';
import { type ReadOptions, readSessionText } from '../session/read.js';
import { parseFieldName, parseYamlSource } from '../session/yamlSource.js';
import {
  CommandFailure,
  EXIT_OK,
  EXIT_PROBLEMS,
  loadCatalogFor,
  loadConfig,
  printDiagnostics,
} from './common.js';

export interface VetResult {
  file: string;
  ok: boolean;
  /** The session id when the file reads (used to find ids used twice). */
  id: string | null;
  diagnostics: Diagnostic[];
}

/**
 * Warnings raised after reading (unknown candidates) carry no position of their own; put
 * them at their field in the file.
 */
function placed(diagnostics: Diagnostic[], text: string, file: string): Diagnostic[] {
  if (!diagnostics.some((d) => d.field && d.line === 1 && d.col === 1)) return diagnostics;
  const source = parseYamlSource(text, file).source;
  if (!source) return diagnostics;
  return diagnostics.map((d) =>
    d.field && d.line === 1 && d.col === 1 ? { ...d, ...source.positionOf(parseFieldName(d.field)) } : d,
  );
}

/** The check of one session, pure: bytes and catalog in, diagnostics out. */
export function vetSession(
  file: string,
  bytes: Uint8Array,
  catalog: Catalog,
  options: ReadOptions = {},
): VetResult {
  const read = readSessionText(bytes, file, options);
  if (!read.ok)
    return { file, ok: false, id: null, diagnostics: [...read.diagnostics].sort(compareDiagnostics) };
  const found: Diagnostic[] = [...read.warnings];
  const reduced = reduceSession(read.value);
  found.push(
    ...(reduced.ok ? [...reduced.warnings, ...outOfRangeWarnings(reduced.value)] : reduced.diagnostics),
  );
  found.push(...candidateSpecies(read.value, catalog).warnings);
  const text = new TextDecoder().decode(bytes);
  const diagnostics = placed(found, text, file).sort(compareDiagnostics);
  return {
    file,
    ok: !diagnostics.some((d) => d.severity === 'error'),
    id: read.value.id,
    diagnostics,
  };
}

/** A session id may be used once per archive (as the build requires); later files get an error. */
export function markDuplicateIds(results: VetResult[]): VetResult[] {
  const seen = new Map<string, string>();
  return results.map((r) => {
    if (r.id === null) return r;
    const first = seen.get(r.id);
    if (first === undefined) {
      seen.set(r.id, r.file);
      return r;
    }
    const d: Diagnostic = {
      file: r.file,
      line: 1,
      col: 1,
      severity: 'error',
      code: 'duplicate-id',
      field: 'id',
      message: `session id "${r.id}" is already used by ${first}`,
      hint: 'give this session its own id: (lower-case letters, digits and dashes)',
    };
    return { ...r, ok: false, diagnostics: [...r.diagnostics, d] };
  });
}

const SESSION_FILE = /\.ya?ml$/i;

/** A file to check, with the folder its links must stay inside (null: a file named by the user). */
export interface VetFile {
  path: string;
  root: string | null;
}

/** The files to check: named files as given, folders' *.yaml / *.yml (deeper with recursive). */
export function collectFiles(paths: readonly string[], recursive: boolean): VetFile[] {
  const out: VetFile[] = [];
  const walk = (dir: string, root: string) => {
    let entries: import('node:fs').Dirent[];
    try {
      entries = readdirSync(dir, { withFileTypes: true });
    } catch (e) {
      throw new CommandFailure(`cannot read the folder ${dir}: ${(e as Error).message}`);
    }
    for (const e of entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0))) {
      const p = join(dir, e.name);
      if (e.isDirectory()) {
        if (recursive && !e.name.startsWith('.') && e.name !== 'node_modules') walk(p, root);
      } else if (SESSION_FILE.test(e.name)) out.push({ path: p, root });
    }
  };
  for (const path of paths) {
    let isDir: boolean;
    try {
      isDir = statSync(path).isDirectory();
    } catch {
      throw new CommandFailure(`cannot find ${path}`);
    }
    if (isDir) walk(path, path);
    else out.push({ path, root: null });
  }
  return out;
}

export function summaryLine(results: readonly VetResult[]): string {
  const clean = results.filter((r) => r.ok).length;
  const warnings = results.reduce(
    (n, r) => n + r.diagnostics.filter((d) => d.severity === 'warning').length,
    0,
  );
  const files = results.length === 1 ? '1 file' : `${results.length} files`;
  const warned = warnings === 0 ? '' : ` (${warnings} warning${warnings === 1 ? '' : 's'})`;
  return `${files} checked: ${clean} clean, ${results.length - clean} with problems${warned}`;
}

interface VetFlags {
  recursive?: boolean;
  format?: string;
  config?: string;
}

function vet(paths: string[], opts: VetFlags): number {
  const format = opts.format ?? 'human';
  if (format !== 'human' && format !== 'json')
    throw new CommandFailure(`unknown --format ${format}: use human or json`);
  const files = collectFiles(paths, opts.recursive ?? false);
  const config = loadConfig(opts.config);
  const catalog = loadCatalogFor(config);
  const texts = new Map<string, Uint8Array>();
  const results = markDuplicateIds(
    files.flatMap(({ path, root }): VetResult[] => {
      // The same safe read as the build: links checked, size checked before reading.
      const input = readSessionInput(path, root);
      if (input === null) return [];
      if ('problem' in input) return [{ file: path, ok: false, id: null, diagnostics: [input.problem] }];
      texts.set(path, input.bytes);
      return [
        vetSession(path, input.bytes, catalog, {
          instrumentDefaults: config.defaultInstrument,
          profile: readProfileInput(path, input.bytes, profileFileOf),
        }),
      ];
    }),
  );
  if (format === 'json') {
    const clean = results.filter((r) => r.ok).length;
    const count = (s: string) =>
      results.reduce((n, r) => n + r.diagnostics.filter((d) => d.severity === s).length, 0);
    const document = {
      files: results.map((r) => ({ file: r.file, ok: r.ok, diagnostics: r.diagnostics })),
      summary: {
        files: results.length,
        clean,
        with_problems: results.length - clean,
        errors: count('error'),
        warnings: count('warning'),
      },
    };
    process.stdout.write(`${JSON.stringify(document, null, 2)}\n`);
  } else {
    for (const r of results) {
      const bytes = texts.get(r.file);
      const text = bytes ? new TextDecoder().decode(bytes).replace(/^\ufeff/, '') : undefined;
      printDiagnostics(r.diagnostics, text);
    }
    process.stderr.write(`${summaryLine(results)}\n`);
  }
  return results.every((r) => r.ok) ? EXIT_OK : EXIT_PROBLEMS;
}

export function registerVet(program: Command, done: (code: number) => void): void {
  program
    .command('vet')
    .description('check session files (or every *.yaml in folders) without building; exit 1 on problems')
    .argument('<paths...>', 'session files or folders of sessions')
    .option('-r, --recursive', 'also check the sessions in sub-folders')
    .option('--format <format>', 'human (compiler style, the default) or json (to stdout)', 'human')
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .action((paths: string[], opts: VetFlags) => done(vet(paths, opts)));
}
