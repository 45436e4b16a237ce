/**
 * The validators the build compiles to code (src/session/validatorSource.ts) report exactly
 * what validators compiled at run time report, and are used only for the schema they were
 * made from.
 */
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Type } from '@sinclair/typebox';
import { Ajv } from 'ajv';
import { afterAll, describe, expect, it } from 'vitest';
import { ProjectConfigSchema } from '../src/config/schema.js';
import { SessionSchema } from '../src/session/schema.js';
import {
  AJV_OPTIONS,
  EXPECT_KEYWORD,
  PRECOMPILED_VALIDATORS_FILE,
  precompiledValidator,
  publishedSchema,
  validateWith,
  validatorKey,
} from '../src/session/validate.js';
import { precompiledValidatorsSource } from '../src/session/validatorSource.js';
import { parseYamlSource } from '../src/session/yamlSource.js';
import { DIST, tempDir } from './build/helpers.js';

// Inside the project: the compiled code requires Ajv's runtime helpers from node_modules.
const here = join(process.cwd(), 'node_modules', '.cache');
mkdirSync(here, { recursive: true });
const folder = mkdtempSync(join(here, 'll-validators-'));
const file = join(folder, 'validators.precompiled.cjs');
afterAll(() => rmSync(folder, { recursive: true, force: true }));
writeFileSync(file, precompiledValidatorsSource({ session: SessionSchema, config: ProjectConfigSchema }));
const runtime = new Ajv(AJV_OPTIONS);
runtime.addKeyword(EXPECT_KEYWORD);

// Sessions with problems of every kind the schema finds, and the demo's own sessions.
const broken = [
  'lineledger: 1\ncolour: blue\nmedium: Air\nmeasurement: { unit: Å, sigma: -1 }\nlines:\n  - { wavelength: abc, colr: green }\n  - intensity: 3\n',
  'lineledger: 2\nsource: { kind: sky, name: blue sky, not the Sun }\nlines: []\n',
  'lineledger: 1\nmeasurement: { method: angle, grating: { lines_per_mm: "many" } }\nlines:\n  - { angle: [1, 2] }\n',
  'lines:\n  - 5\n',
];
const demo = readdirSync('data/sessions')
  .filter((n) => n.endsWith('.yaml'))
  .map((n) => readFileSync(join('data/sessions', n), 'utf8'));

describe('precompiled validators', () => {
  const session = precompiledValidator(file, 'session', SessionSchema);
  const compiled = runtime.compile(SessionSchema);

  it('give the same diagnostics as a validator compiled at run time', () => {
    expect(session).not.toBeNull();
    for (const text of [...broken, ...demo]) {
      const parsed = parseYamlSource(text, 's.yaml');
      if (!parsed.source) continue;
      const fromCode = validateWith(session as NonNullable<typeof session>, parsed.source, 's.yaml');
      const fromRuntime = validateWith(compiled, parsed.source, 's.yaml');
      expect(fromCode).toEqual(fromRuntime);
    }
    // The broken ones did break: the comparison is not between two empty lists.
    const first = parseYamlSource(broken[0] as string, 's.yaml').source;
    if (!first) throw new Error('the first broken session does not parse as YAML');
    expect(validateWith(compiled, first, 's.yaml').diagnostics.length).toBeGreaterThan(3);
  });

  it('give the same diagnostics for the project config', () => {
    const config = precompiledValidator(file, 'config', ProjectConfigSchema);
    expect(config).not.toBeNull();
    const parsed = parseYamlSource(
      'title: 5\nsesions: here\ndefault_instrument: { resolution_nm: -1 }\n',
      'c.yaml',
    );
    if (!parsed.source) throw new Error('the broken config does not parse as YAML');
    const fromCode = validateWith(config as NonNullable<typeof config>, parsed.source, 'c.yaml');
    expect(fromCode.diagnostics.length).toBeGreaterThan(0);
    expect(fromCode).toEqual(validateWith(runtime.compile(ProjectConfigSchema), parsed.source, 'c.yaml'));
  });

  it('are not used for a schema other than the one they were made from', () => {
    expect(precompiledValidator(file, 'session', Type.Object({ other: Type.String() }))).toBeNull();
    expect(precompiledValidator(file, 'nothing', SessionSchema)).toBeNull();
    expect(
      precompiledValidator(join(tempDir('ll-validators-'), 'none.cjs'), 'session', SessionSchema),
    ).toBeNull();
  });

  it('come from the published JSON Schemas, which are the TypeBox definitions as plain JSON', () => {
    // The program validates with schema/*.json (it never loads TypeBox): same schema, same key.
    expect(validatorKey(publishedSchema('session'))).toBe(validatorKey(SessionSchema));
    expect(validatorKey(publishedSchema('config'))).toBe(validatorKey(ProjectConfigSchema));
    expect(precompiledValidator(file, 'session', publishedSchema('session'))).not.toBeNull();
  });

  it('are made by the build for the program in dist/, from the schemas as they are now', () => {
    const built = join(DIST, 'session', PRECOMPILED_VALIDATORS_FILE);
    expect(precompiledValidator(built, 'session', SessionSchema)).not.toBeNull();
    expect(precompiledValidator(built, 'config', ProjectConfigSchema)).not.toBeNull();
  });
});
