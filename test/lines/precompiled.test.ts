/**
 * The catalog parsed at build time (src/lines/precompiled.ts) is the catalog a fresh parse
 * gives, and it is never used for files other than those it was made from.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readCatalogInput } from '../../src/lines/load.js';
import { parseCatalog } from '../../src/lines/parse.js';
import {
  PRECOMPILED_CATALOG_FILE,
  readPrecompiledCatalog,
  writePrecompiledCatalog,
} from '../../src/lines/precompiled.js';
import { DIST, tempDir } from '../build/helpers.js';

describe('precompiled catalog', () => {
  const input = readCatalogInput();
  const parsed = parseCatalog(input);
  if (!parsed.ok) throw new Error('the bundled catalog does not parse');
  const file = join(tempDir('ll-precompiled-'), 'catalog.v8');
  writePrecompiledCatalog(file, input, parsed);

  it('reads back exactly the catalog that parsing the same files gives', () => {
    const back = readPrecompiledCatalog(file, input);
    expect(back).not.toBeNull();
    expect(back).toEqual(parsed);
    expect(back?.value.species.get('Hg I')?.vacuum_nm).toEqual(parsed.value.species.get('Hg I')?.vacuum_nm);
  });

  it('is ignored once any input file differs, by a single byte or by its name', () => {
    const edited = {
      ...input,
      lineFiles: input.lineFiles.map((f, i) => (i === 0 ? { ...f, text: `${f.text}\n` } : f)),
    };
    expect(readPrecompiledCatalog(file, edited)).toBeNull();
    const priors = input.priorsYaml;
    if (priors)
      expect(
        readPrecompiledCatalog(file, { ...input, priorsYaml: { ...priors, text: `${priors.text} ` } }),
      ).toBeNull();
    const renamed = { ...input, sourceFiles: input.sourceFiles.map((f) => ({ ...f, name: `x${f.name}` })) };
    expect(readPrecompiledCatalog(file, renamed)).toBeNull();
  });

  it('is made by the build for the program in dist/, from the files as they are now', () => {
    // npm test compiles (npm run build:ts) before it runs the tests.
    const built = join(DIST, 'lines', PRECOMPILED_CATALOG_FILE);
    expect(readPrecompiledCatalog(built, input)).toEqual(parsed);
  });

  it('is ignored when the stored file is damaged or missing', () => {
    const damaged = join(tempDir('ll-precompiled-'), 'catalog.v8');
    writeFileSync(damaged, 'not a serialised catalog');
    expect(readPrecompiledCatalog(damaged, input)).toBeNull();
    expect(readPrecompiledCatalog(join(tempDir('ll-precompiled-'), 'none.v8'), input)).toBeNull();
  });
});
