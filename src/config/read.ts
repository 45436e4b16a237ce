/** lineledger.yaml text → resolved ProjectConfig (paths made absolute against the file's folder). */
import { dirname, resolve } from 'node:path';
import type { Outcome } from '../diagnostics.js';
import type { InstrumentSpec } from '../session/types.js';
import { compileValidator, validateWith } from '../session/validate.js';
import { parseYamlSource } from '../session/yamlSource.js';
import { type ProjectConfigDocument, ProjectConfigSchema } from './schema.js';

export const CONFIG_FILE_NAME = 'lineledger.yaml';

/** Instrument settings a session inherits field by field when it gives none. */
export type DefaultInstrument = InstrumentSpec;

export interface ProjectConfig {
  file: string | null;
  title: string;
  owner: string | null;
  introMarkdown: string;
  sessionsDir: string | null;
  outDir: string | null;
  defaultInstrument: DefaultInstrument | null;
  catalogs: { lines: string; sources: string }[];
}

export const DEFAULT_TITLE = 'lineledger archive';

export function defaultConfig(): ProjectConfig {
  return {
    file: null,
    title: DEFAULT_TITLE,
    owner: null,
    introMarkdown: '',
    sessionsDir: null,
    outDir: null,
    defaultInstrument: null,
    catalogs: [],
  };
}

let configValidator: ReturnType<typeof compileValidator<ProjectConfigDocument>> | null = null;

export function readProjectConfig(text: string, file: string): Outcome<ProjectConfig> {
  const parsed = parseYamlSource(text, file);
  if (!parsed.source) return { ok: false, diagnostics: parsed.diagnostics };
  configValidator ??= compileValidator<ProjectConfigDocument>(ProjectConfigSchema);
  const { document, diagnostics } = validateWith(configValidator, parsed.source, file);
  if (!document) return { ok: false, diagnostics };
  const base = dirname(resolve(file));
  const at = (p: string | undefined) => (p === undefined ? null : resolve(base, p));
  const inst = document.default_instrument;
  return {
    ok: true,
    value: {
      file,
      title: document.title ?? DEFAULT_TITLE,
      owner: document.owner ?? null,
      introMarkdown: document.intro ?? '',
      sessionsDir: at(document.sessions),
      outDir: at(document.out),
      defaultInstrument: inst
        ? {
            description: inst.description ?? null,
            resolution_nm: inst.resolution_nm ?? null,
            resolving_power: inst.resolving_power ?? null,
            range_nm: inst.range_nm ? [inst.range_nm[0] as number, inst.range_nm[1] as number] : null,
          }
        : null,
      catalogs: (document.catalogs ?? []).map((c) => ({
        lines: resolve(base, c.lines),
        sources: resolve(base, c.sources),
      })),
    },
    warnings: [],
  };
}
