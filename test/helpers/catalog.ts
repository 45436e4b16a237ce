import { loadCatalog } from '../../src/lines/load.js';
import type { Catalog } from '../../src/lines/types.js';

let cached: Catalog | null = null;

/** The bundled catalog, loaded once per test file. */
export function bundledCatalog(): Catalog {
  if (cached) return cached;
  const loaded = loadCatalog();
  if (!loaded.ok)
    throw new Error(`bundled catalog has problems: ${JSON.stringify(loaded.diagnostics.slice(0, 3))}`);
  cached = loaded.value;
  return cached;
}
