/**
 * Writes the published JSON Schemas from their one TypeBox definitions (npm run schema):
 * schema/session-1.schema.json and schema/project-1.schema.json. The program validates with
 * these files (src/session/validate.ts), so run this after changing either definition; a test
 * fails until they match.
 */
import { writeFileSync } from 'node:fs';
import { projectConfigJsonSchema } from '../src/config/schema.js';
import { sessionJsonSchema } from '../src/session/schema.js';

for (const [file, schema] of [
  ['schema/session-1.schema.json', sessionJsonSchema()],
  ['schema/project-1.schema.json', projectConfigJsonSchema()],
] as const) {
  writeFileSync(file, `${JSON.stringify(schema, null, 2)}\n`);
  process.stdout.write(`wrote ${file}\n`);
}
