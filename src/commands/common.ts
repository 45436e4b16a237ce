/** What every command shares: exit codes and printing diagnostics (./output.ts), the config and the catalog. */
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { CONFIG_FILE_NAME, defaultConfig, type ProjectConfig, readProjectConfig } from '../config/read.js';
import { loadCatalog } from '../lines/load.js';
import type { Catalog } from '../lines/types.js';
import { CommandFailure, printDiagnostics } from './output.js';

export { CommandFailure, EXIT_CANNOT_RUN, EXIT_OK, EXIT_PROBLEMS, printDiagnostics } from './output.js';

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
