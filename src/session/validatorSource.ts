/**
 * Build time only (dist/precompile.js): the bundled schemas' validators as Ajv standalone code,
 * one CommonJS module exporting each by name and, under `keys`, what each was made from
 * (validate.ts `validatorKey`), so a schema changed since is compiled afresh instead.
 */
import { Ajv } from 'ajv';
import standalone from 'ajv/dist/standalone/index.js';
import { AJV_OPTIONS, EXPECT_KEYWORD, type JsonSchema, validatorKey } from './validate.js';

type StandaloneCode = (ajv: Ajv, refs: Record<string, string>) => string;

export function precompiledValidatorsSource(schemas: Record<string, JsonSchema>): string {
  const ajv = new Ajv({ ...AJV_OPTIONS, code: { source: true } });
  ajv.addKeyword(EXPECT_KEYWORD);
  const keys: Record<string, string> = {};
  for (const [name, schema] of Object.entries(schemas)) {
    ajv.addSchema(schema, name);
    keys[name] = validatorKey(schema);
  }
  const generate = ((standalone as unknown as { default?: StandaloneCode }).default ??
    standalone) as unknown as StandaloneCode;
  const code = generate(ajv, Object.fromEntries(Object.keys(schemas).map((n) => [n, n])));
  return `// Written by dist/precompile.js from the bundled schemas: do not edit.\n${code}\nmodule.exports.keys = ${JSON.stringify(keys)};\n`;
}
