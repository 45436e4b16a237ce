/** Writes schema/session-1.schema.json from the one TypeBox definition (npm run schema). */
import { writeFileSync } from 'node:fs';
import { sessionJsonSchema } from '../src/session/schema.js';

writeFileSync('schema/session-1.schema.json', `${JSON.stringify(sessionJsonSchema(), null, 2)}\n`);
process.stdout.write('wrote schema/session-1.schema.json\n');
