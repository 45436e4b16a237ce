import { readFileSync } from 'node:fs';
import { Ajv2020 } from 'ajv/dist/2020.js';
import { describe, expect, it } from 'vitest';
import { projectConfigJsonSchema } from '../src/config/schema.js';
import { sessionJsonSchema } from '../src/session/schema.js';

describe('published JSON Schema', () => {
  it('is the committed file, generated from the one definition (run npm run schema after a change)', () => {
    const committed = JSON.parse(readFileSync('schema/session-1.schema.json', 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(sessionJsonSchema())));
  });

  it('for the project config too, generated from its one definition', () => {
    const committed = JSON.parse(readFileSync('schema/project-1.schema.json', 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(projectConfigJsonSchema())));
  });

  it('is a valid draft 2020-12 schema that accepts the demo sessions’ shape', () => {
    const ajv = new Ajv2020({ strict: false });
    const validate = ajv.compile(sessionJsonSchema());
    expect(validate({ lineledger: 1, lines: [{ wavelength: 500 }] })).toBe(true);
    expect(validate({ lineledger: 1, lines: [{ wavelenght: 500 }] })).toBe(false);
  });
});
