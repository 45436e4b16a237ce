/** Where the bundled data lives: apart from the catalog reader, so that finding it loads no parser. */
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The package's own data/ folder, found from this module's location (src/ or dist/). */
export function bundledDataDir(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', 'data');
}
