/**
 * The bundled catalog, parsed once when the program is built (`npm run build:ts` runs
 * dist/precompile.js) and kept beside the compiled module as V8's serialisation of the parsed
 * Catalog. Parsing the bundled YAML and TSV files takes 80–100 ms at every program start on the
 * project's machine (the YAML library, cold, is most of it); reading the serialised catalog
 * back takes about 5 ms. It is used only when its key — a SHA-256 over the name and text of
 * every input file, exactly as read — matches the files on disk, so an edited data file is
 * always parsed afresh (and its problems reported) rather than overruled.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import { deserialize, serialize } from 'node:v8';
import type { Outcome } from '../diagnostics.js';
import type { CatalogInput } from './parse.js';
import type { Catalog } from './types.js';

/** The file name, beside the compiled lines module (dist/lines/). */
export const PRECOMPILED_CATALOG_FILE = 'bundled-catalog.v8';

/** Bumped whenever the serialised form changes meaning (an old file is then ignored). */
const FORMAT = 'lineledger-precompiled-catalog 1';

/** SHA-256 over every input the catalog is parsed from, in a fixed order. */
export function catalogInputKey(input: CatalogInput): string {
  const hash = createHash('sha256').update(`${FORMAT}\n`).update(input.version);
  const files = [
    ...input.lineFiles,
    ...input.sourceFiles,
    ...(input.conditionFiles ?? []),
    ...(input.groupsYaml ? [input.groupsYaml] : []),
    ...(input.priorsYaml ? [input.priorsYaml] : []),
  ];
  for (const f of files) hash.update(`\n${f.name}\n${f.text.length}\n`).update(f.text);
  return hash.digest('hex');
}

/** A catalog that parsed: the value and its warnings. */
type Parsed = Extract<Outcome<Catalog>, { ok: true }>;

interface Stored {
  key: string;
  parsed: Parsed;
}

export function writePrecompiledCatalog(path: string, input: CatalogInput, parsed: Parsed): void {
  writeFileSync(path, serialize({ key: catalogInputKey(input), parsed } satisfies Stored));
}

/** The stored catalog when it was made from exactly this input; null otherwise (or unreadable). */
export function readPrecompiledCatalog(path: string, input: CatalogInput): Parsed | null {
  let stored: Stored;
  try {
    stored = deserialize(readFileSync(path)) as Stored;
  } catch {
    return null;
  }
  return stored && stored.key === catalogInputKey(input) && stored.parsed?.ok === true ? stored.parsed : null;
}
