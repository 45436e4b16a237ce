/**
 * The project config file `lineledger.yaml`: site-level settings of an archive. Defined with
 * TypeBox like the session format, validated by the same Ajv set-up, same diagnostics.
 */
import { type Static, Type } from '@sinclair/typebox';

const Strict = { additionalProperties: false } as const;

export const ProjectConfigSchema = Type.Object(
  {
    $schema: Type.Optional(Type.String()),
    'lineledger-project': Type.Literal(1, {
      description: 'Config format version',
      'x-expect': 'the number 1',
    }),
    title: Type.Optional(Type.String({ maxLength: 200, description: "The archive's title" })),
    owner: Type.Optional(Type.String({ maxLength: 200, description: 'Who keeps the archive' })),
    intro: Type.Optional(Type.String({ maxLength: 20_000, description: 'Short introduction, Markdown' })),
    sessions: Type.Optional(
      Type.String({ maxLength: 500, description: 'Folder of session files, relative to this file' }),
    ),
    out: Type.Optional(Type.String({ maxLength: 500, description: 'Output folder, relative to this file' })),
    default_instrument: Type.Optional(
      Type.Object(
        {
          description: Type.Optional(Type.String({ maxLength: 500 })),
          resolution_nm: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          resolving_power: Type.Optional(Type.Number({ exclusiveMinimum: 0 })),
          range_nm: Type.Optional(
            Type.Array(Type.Number({ exclusiveMinimum: 0 }), { minItems: 2, maxItems: 2 }),
          ),
        },
        { ...Strict, description: 'Instrument settings a session inherits when it gives none' },
      ),
    ),
    catalogs: Type.Optional(
      Type.Array(
        Type.Object(
          {
            lines: Type.String({ maxLength: 500, description: 'A TSV line list in the catalog format' }),
            sources: Type.String({ maxLength: 500, description: 'The YAML file citing its source keys' }),
          },
          Strict,
        ),
        { maxItems: 20, description: "The archive's own line lists, used beside the bundled catalog" },
      ),
    ),
  },
  { ...Strict, title: 'lineledger project config' },
);

export type ProjectConfigDocument = Static<typeof ProjectConfigSchema>;

/** The config's JSON Schema as published in schema/project-1.schema.json (plain JSON). */
export function projectConfigJsonSchema(): Record<string, unknown> {
  const plain = JSON.parse(JSON.stringify(ProjectConfigSchema)) as Record<string, unknown>;
  return { $schema: 'https://json-schema.org/draft/2020-12/schema', ...plain };
}
