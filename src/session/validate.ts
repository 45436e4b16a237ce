/**
 * Schema validation with Ajv (the reference JSON Schema validator), its errors turned into
 * diagnostics at the right file:line:col. `allErrors` so that every problem of a file is
 * reported in one go.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Ajv as AjvInstance, ErrorObject, ValidateFunction } from 'ajv';
import type { Diagnostic } from '../diagnostics.js';
import type { SessionDocument } from './schema.js';
import { didYouMean } from './suggest.js';
import { type FieldPath, fieldName, type YamlSource } from './yamlSource.js';

export const AJV_OPTIONS = { allErrors: true, verbose: true, strict: true, allowUnionTypes: true } as const;
/** Our annotation: what a value should be, in words, for the diagnostic. */
export const EXPECT_KEYWORD = { keyword: 'x-expect', schemaType: 'string' } as const;

/** A JSON Schema as a plain object (a TypeBox definition is one too). */
export type JsonSchema = Record<string, unknown>;

/** The documents the program validates, each with its published schema in schema/. */
export type SchemaName = 'session' | 'config';
const SCHEMA_FILES: Record<SchemaName, string> = {
  session: 'session-1.schema.json',
  config: 'project-1.schema.json',
};

/** The package's schema/ folder (beside src/ and dist/). */
export function schemaDir(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', '..', 'schema');
}

/**
 * A published schema as the program validates with it: the JSON that `npm run schema` writes
 * from the one TypeBox definition (a test keeps them equal), without its `$schema` line (Ajv's
 * default draft reads the rest). Reading it is plain JSON: the program never loads TypeBox,
 * which alone took about 75 ms at each start.
 */
export function publishedSchema(name: SchemaName): JsonSchema {
  const { $schema: _draft, ...schema } = JSON.parse(
    readFileSync(join(schemaDir(), SCHEMA_FILES[name]), 'utf8'),
  ) as JsonSchema;
  return schema;
}

/** The validators the build compiled to code (validatorSource.ts), beside this module in dist/session/. */
export const PRECOMPILED_VALIDATORS_FILE = 'validators.precompiled.cjs';

export function precompiledValidatorsPath(): string {
  return join(dirname(fileURLToPath(import.meta.url)), PRECOMPILED_VALIDATORS_FILE);
}

const requireHere = createRequire(import.meta.url);
const AJV_VERSION = (requireHere('ajv/package.json') as { version: string }).version;

/**
 * Ajv itself (about 15 ms to load) only when a schema must be compiled here: with the build's
 * precompiled validators a run needs just the small runtime helpers their code requires.
 */
let ajvInstance: AjvInstance | null = null;
function runtimeAjv(): AjvInstance {
  if (!ajvInstance) {
    const { Ajv } = requireHere('ajv') as typeof import('ajv');
    ajvInstance = new Ajv(AJV_OPTIONS);
    ajvInstance.addKeyword(EXPECT_KEYWORD);
  }
  return ajvInstance;
}

/** What a compiled validator depends on: Ajv's version, its options and the schema. */
export function validatorKey(schema: JsonSchema): string {
  return createHash('sha256')
    .update(`ajv ${AJV_VERSION}\n${JSON.stringify(AJV_OPTIONS)}\n${JSON.stringify(EXPECT_KEYWORD)}\n`)
    .update(JSON.stringify(schema))
    .digest('hex');
}

/** The validator the build compiled for `name`, when it was made from this very schema. */
export function precompiledValidator<T>(
  file: string,
  name: string,
  schema: JsonSchema,
): ValidateFunction<T> | null {
  try {
    const module = requireHere(file) as { keys?: Record<string, string> } & Record<string, unknown>;
    const validate = module[name];
    return module.keys?.[name] === validatorKey(schema) && typeof validate === 'function'
      ? (validate as ValidateFunction<T>)
      : null;
  } catch {
    return null;
  }
}

/**
 * A validator with the same diagnostics whichever way it was made: the build's compiled code
 * for the schema (Ajv's standalone code, loaded in a few ms against 30–60 ms to compile at each
 * program start), else compiled here.
 */
export function compileValidator<T>(schema: JsonSchema, name?: string): ValidateFunction<T> {
  const ready =
    name === undefined ? null : precompiledValidator<T>(precompiledValidatorsPath(), name, schema);
  return ready ?? runtimeAjv().compile<T>(schema);
}

// Made on first use: commands that read no session (lookup, preview, a cached rebuild) never
// pay for it.
const validators = new Map<SchemaName, ValidateFunction<unknown>>();

/** The validator of a document type, from its published schema. */
export function validatorFor<T>(name: SchemaName): ValidateFunction<T> {
  let v = validators.get(name);
  if (!v) {
    v = compileValidator<unknown>(publishedSchema(name), name);
    validators.set(name, v);
  }
  return v as ValidateFunction<T>;
}

function validateSession(): ValidateFunction<SessionDocument> {
  return validatorFor<SessionDocument>('session');
}

function pathOf(instancePath: string): (string | number)[] {
  if (!instancePath) return [];
  return instancePath
    .slice(1)
    .split('/')
    .map((raw) => raw.replace(/~1/g, '/').replace(/~0/g, '~'))
    .map((part) => (/^\d+$/.test(part) ? Number(part) : part));
}

function expectText(error: ErrorObject): string | undefined {
  const parent = error.parentSchema as Record<string, unknown> | undefined;
  const text = parent?.['x-expect'];
  return typeof text === 'string' ? text : undefined;
}

export function validateDocument(source: YamlSource, file: string): SchemaCheck<SessionDocument> {
  return validateWith(validateSession(), source, file);
}

/** Whether a value passes the session schema (the pruned copy of a document, see prune.ts). */
export function isSessionDocument(data: unknown): data is SessionDocument {
  return validateSession()(data);
}

export interface SchemaCheck<T> {
  document: T | null;
  diagnostics: Diagnostic[];
  /**
   * Where the schema's problems are: an unknown key's own path, an invalid value's path.
   * Null when some problem is a missing key (nothing there to take out).
   */
  problemPaths: FieldPath[] | null;
}

export function validateWith<T>(
  validate: ValidateFunction<T>,
  source: YamlSource,
  file: string,
): SchemaCheck<T> {
  if (validate(source.data)) return { document: source.data, diagnostics: [], problemPaths: [] };
  const errors = validate.errors ?? [];
  // Unions by the value they are about, so each error looks only at the unions of its own
  // value and its parents (linear in the errors: 4000 bad lines took seconds comparing all pairs).
  const unions = new Map<string, ErrorObject[]>();
  for (const e of errors)
    if (e.keyword === 'anyOf') unions.set(e.instancePath, [...(unions.get(e.instancePath) ?? []), e]);
  const underUnion = (e: ErrorObject) => {
    const parts = e.instancePath.split('/');
    for (let n = parts.length; n >= 1; n--)
      for (const u of unions.get(parts.slice(0, n).join('/')) ?? [])
        if (u !== e && e.schemaPath.startsWith(`${u.schemaPath}/`)) return true;
    return false;
  };
  const shown = errors.filter((e) => !underUnion(e));
  const diagnostics = shown.map((e) => toDiagnostic(e, source, file));
  const problemPaths = shown.some((e) => e.keyword === 'required')
    ? null
    : shown.map((e) =>
        e.keyword === 'additionalProperties'
          ? [
              ...pathOf(e.instancePath),
              String((e.params as { additionalProperty: string }).additionalProperty),
            ]
          : pathOf(e.instancePath),
      );
  return { document: null, diagnostics, problemPaths };
}

/** Usual other spellings of allowed words (unit symbols, capitals). */
const ALIASES: Record<string, string> = { å: 'angstrom', a: 'angstrom', Å: 'angstrom', µm: 'um', μm: 'um' };

function spellingOf(given: string, allowed: readonly string[]): string | null {
  const lower = given.trim().toLowerCase();
  const alias = ALIASES[given.trim()] ?? ALIASES[lower];
  if (alias && allowed.includes(alias)) return alias;
  const same = allowed.find((a) => a.toLowerCase() === lower);
  return same ?? didYouMean(given, allowed);
}

function toDiagnostic(error: ErrorObject, source: YamlSource, file: string): Diagnostic {
  const path = pathOf(error.instancePath);
  const base = { file, severity: 'error' as const };
  switch (error.keyword) {
    case 'additionalProperties': {
      const key = String((error.params as { additionalProperty: string }).additionalProperty);
      const keyPath: FieldPath = [...path, key];
      const known = Object.keys(
        ((error.parentSchema as { properties?: Record<string, unknown> }).properties ?? {}) as object,
      );
      const guess = didYouMean(key, known);
      return {
        ...base,
        ...source.positionOf(keyPath, true),
        code: 'unknown-key',
        field: fieldName(keyPath),
        message: `unknown key "${key}"`,
        // A key with spaces is most often the tail of an unquoted value such as
        // `{ name: blue sky, not the Sun }`, which YAML splits at the comma.
        hint: /\s/.test(key.trim())
          ? `"${key}" looks like part of a value: a value that holds a comma or a colon must be quoted, such as name: "blue sky, not the Sun"`
          : guess
            ? `did you mean "${guess}"?`
            : `allowed here: ${known.join(', ')}`,
      };
    }
    case 'required': {
      const missing = String((error.params as { missingProperty: string }).missingProperty);
      return {
        ...base,
        ...source.positionOf(path),
        code: 'missing-key',
        field: fieldName([...path, missing]),
        message: `required key "${missing}" is missing`,
        hint: missing === 'lineledger' ? 'add `lineledger: 1` as the first line' : `add "${missing}"`,
      };
    }
    case 'enum': {
      const allowed = ((error.params as { allowedValues: unknown[] }).allowedValues ?? []).map(String);
      const given = String(error.data);
      const guess = spellingOf(given, allowed);
      return {
        ...base,
        ...source.positionOf(path),
        code: 'invalid-value',
        field: fieldName(path),
        message: `"${given}" is not one of ${allowed.join(', ')}`,
        hint: guess ? `did you mean "${guess}"?` : undefined,
      };
    }
    default: {
      const expected = expectText(error);
      const empty = error.keyword === 'minItems' && (error.params as { limit: number }).limit === 1;
      return {
        ...base,
        ...source.positionOf(path),
        code: empty ? 'empty-list' : 'invalid-value',
        field: fieldName(path),
        message: empty
          ? 'the list is empty'
          : expected
            ? `must be ${expected}`
            : (error.message ?? 'invalid value'),
        hint: empty ? 'add at least one entry' : undefined,
      };
    }
  }
}
