/** What every command shares: exit codes, printing diagnostics, the config and the catalog. */
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { CONFIG_FILE_NAME, defaultConfig, type ProjectConfig, readProjectConfig } from '../config/read.js';
import { type Diagnostic, formatDiagnosticsWithSource } from '../diagnostics.js';
import { loadCatalog } from '../lines/load.js';
import type { Catalog } from '../lines/types.js';

export const EXIT_OK = 0;
export const EXIT_PROBLEMS = 1;
export const EXIT_CANNOT_RUN = 2;

/** Thrown inside a command to stop with a message and an exit code (caught in cli.ts). */
export class CommandFailure extends Error {
  constructor(
    message: string,
    readonly exitCode: number = EXIT_CANNOT_RUN,
  ) {
    super(message);
  }
}

export function printDiagnostics(diagnostics: readonly Diagnostic[], sourceText?: string): void {
  // One write per file: 50,000 problems are one string, not 50,000 system calls.
  const lines = formatDiagnosticsWithSource(diagnostics, sourceText);
  if (lines.length > 0) process.stderr.write(`${lines.join('\n')}\n`);
}

export function readTextOrUndefined(file: string): string | undefined {
  try {
    return readFileSync(file, 'utf8');
  } catch {
    return undefined;
  }
}

/** `--config FILE`, else ./lineledger.yaml when present, else the defaults. */
export function loadConfig(path: string | undefined): ProjectConfig {
  const file = path ?? (existsSync(CONFIG_FILE_NAME) ? CONFIG_FILE_NAME : undefined);
  if (file === undefined) return defaultConfig();
  const text = readTextOrUndefined(file);
  if (text === undefined) throw new CommandFailure(`cannot read the config file ${file}`);
  const config = readProjectConfig(text, resolve(file));
  if (!config.ok) {
    printDiagnostics(
      config.diagnostics.map((d) => ({ ...d, file })),
      text,
    );
    throw new CommandFailure(`the config file ${file} has problems; fix them first`);
  }
  return config.value;
}

export function loadCatalogFor(config: ProjectConfig): Catalog {
  let catalog: ReturnType<typeof loadCatalog>;
  try {
    catalog = loadCatalog(undefined, config.catalogs);
  } catch (e) {
    throw new CommandFailure(`cannot read a line list: ${(e as Error).message}`);
  }
  if (!catalog.ok) {
    printDiagnostics(catalog.diagnostics);
    throw new CommandFailure('the line catalog has problems; fix the line lists first');
  }
  return catalog.value;
}
