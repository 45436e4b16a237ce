/**
 * Run once after compiling (`npm run build:ts`: `node dist/precompile.js`): parses what every
 * program start would otherwise parse again from the bundled files, and keeps the result beside
 * the compiled modules. Each product carries a key of the files it came from and is ignored
 * when they differ (src/lines/precompiled.ts), so it can only save time, never change a result.
 */
import { writeFileSync } from 'node:fs';
import { readTemplateTexts } from './build.js';
import { precompiledCatalogPath, readCatalogInput } from './lines/load.js';
import { parseCatalog } from './lines/parse.js';
import { writePrecompiledCatalog } from './lines/precompiled.js';
import { precompiledTemplatesPath, precompiledTemplatesSource } from './report/templates.js';
import { precompiledValidatorsPath, publishedSchema } from './session/validate.js';
import { precompiledValidatorsSource } from './session/validatorSource.js';

const input = readCatalogInput();
const parsed = parseCatalog(input);
// A broken bundled catalog is left for the program to report, with its positions.
if (parsed.ok) writePrecompiledCatalog(precompiledCatalogPath(), input, parsed);
else process.stderr.write('precompile: the bundled catalog has problems; not precompiled\n');

const texts = readTemplateTexts();
writeFileSync(precompiledTemplatesPath(), precompiledTemplatesSource(texts));

writeFileSync(
  precompiledValidatorsPath(),
  precompiledValidatorsSource({ session: publishedSchema('session'), config: publishedSchema('config') }),
);
