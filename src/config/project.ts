/**
 * The project config as the commands use it (paths made absolute against the file's folder),
 * from a lineledger.yaml document already checked against its schema (./read.ts). No
 * validator here: a build that finds nothing changed maps a config it validated last time.
 */
import { dirname, resolve } from 'node:path';
import type { InstrumentSpec } from '../session/types.js';
import type { ProjectConfigDocument } from './schema.js';

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

export function configFromDocument(document: ProjectConfigDocument, file: string): ProjectConfig {
  const base = dirname(resolve(file));
  const at = (p: string | undefined) => (p === undefined ? null : resolve(base, p));
  const inst = document.default_instrument;
  return {
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
  };
}
