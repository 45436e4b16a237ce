/** The read edge for the catalog: the bundled data folder (or another) from disk. */
import { readdirSync, readFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Outcome } from '../diagnostics.js';
import { bundledDataDir } from './dataDir.js';
import { type CatalogInput, parseCatalog } from './parse.js';
import { PRECOMPILED_CATALOG_FILE, readPrecompiledCatalog } from './precompiled.js';
import type { Catalog, CatalogFile } from './types.js';

export { bundledDataDir };

/** A project's own line list (config `catalogs:`), as absolute paths. */
export interface ExtraCatalog {
  lines: string;
  sources: string;
}

/** Line strengths by condition (src/lines/conditions.ts), beside the line lists. */
export const CONDITIONS_FILE = 'conditions.tsv';

export function readCatalogInput(
  dataDir: string = bundledDataDir(),
  extras: readonly ExtraCatalog[] = [],
): CatalogInput {
  const linesDir = join(dataDir, 'lines');
  // conditions.tsv is not a line list: it gives strengths for lines the line lists hold.
  const names = readdirSync(linesDir)
    .filter((n) => n.endsWith('.tsv') && n !== CONDITIONS_FILE)
    .sort();
  const read = (path: string, name: string) => ({ name, text: readFileSync(path, 'utf8') });
  let groupsYaml: CatalogInput['groupsYaml'] = null;
  try {
    groupsYaml = read(join(dataDir, 'groups.yaml'), 'groups.yaml');
  } catch {
    groupsYaml = null;
  }
  let priorsYaml: CatalogInput['priorsYaml'] = null;
  try {
    priorsYaml = read(join(dataDir, 'priors.yaml'), 'priors.yaml');
  } catch {
    priorsYaml = null;
  }
  let conditionFiles: CatalogFile[] = [];
  try {
    conditionFiles = [read(join(linesDir, CONDITIONS_FILE), CONDITIONS_FILE)];
  } catch {
    conditionFiles = [];
  }
  return {
    version: readFileSync(join(linesDir, 'VERSION'), 'utf8'),
    lineFiles: [
      ...names.map((n) => read(join(linesDir, n), n)),
      ...extras.map((e) => read(e.lines, `project:${basename(e.lines)}`)),
    ],
    sourceFiles: [
      read(join(linesDir, 'sources.yaml'), 'sources.yaml'),
      ...extras.map((e) => read(e.sources, `project:${basename(e.sources)}`)),
    ],
    groupsYaml,
    priorsYaml,
    conditionFiles,
  };
}

/** Where the build puts the bundled catalog, parsed (beside this module in dist/lines/). */
export function precompiledCatalogPath(): string {
  return join(dirname(fileURLToPath(import.meta.url)), PRECOMPILED_CATALOG_FILE);
}

export function loadCatalog(dataDir?: string, extras: readonly ExtraCatalog[] = []): Outcome<Catalog> {
  const input = readCatalogInput(dataDir, extras);
  // The bundled data alone, unchanged since the program was built: parsed already.
  if (dataDir === undefined && extras.length === 0) {
    const ready = readPrecompiledCatalog(precompiledCatalogPath(), input);
    if (ready) return ready;
  }
  return parseCatalog(input);
}
