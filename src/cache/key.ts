/**
 * Cache keys: a SHA-256 over everything a session's files depend on. The context key covers
 * what is shared by every session of a build (program, catalog, templates, settings); a
 * session's key adds its file name (the default id and the name shown in the record) and bytes.
 */
import { createHash } from 'node:crypto';
import type { Catalog } from '../lines/types.js';
import type { SiteSettings } from '../report/site.js';
import type { TemplateTexts } from '../report/templates.js';
import type { ProfileInput } from '../session/profile/types.js';
import type { InstrumentSpec } from '../session/types.js';

export interface ContextKeyInput {
  /** The program's code and dependency pins (see fingerprint.ts). */
  fingerprint: string;
  programVersion: string;
  catalog: Catalog;
  templates: TemplateTexts;
  settings: SiteSettings;
  buildOptions: string;
  builtOn: string | null;
  instrumentDefaults: InstrumentSpec | null;
}

/** Bump when the shape of a cache entry changes. */
export const CACHE_FORMAT = 1;

export function contextKey(input: ContextKeyInput): string {
  const { catalog } = input;
  const parts = {
    format: CACHE_FORMAT,
    fingerprint: input.fingerprint,
    programVersion: input.programVersion,
    // catalog.sha256 covers the line lists and sources; the groups steer identification too.
    catalog: {
      version: catalog.version,
      sha256: catalog.sha256,
      groups: [...catalog.groups.entries()],
      defaults: [...catalog.defaultGroupsBySourceKind.entries()],
      // …and so do the priors by source (data/priors.yaml).
      priors: [[...catalog.priors.kinds.entries()], [...catalog.priors.classes.entries()]],
    },
    // The index template and the stylesheet do not shape a session's files.
    templates: { layout: input.templates.layout, session: input.templates.session },
    settings: input.settings,
    buildOptions: input.buildOptions,
    builtOn: input.builtOn,
    instrumentDefaults: input.instrumentDefaults,
  };
  return createHash('sha256').update(JSON.stringify(parts)).digest('hex');
}

export function sessionKey(
  context: string,
  fileName: string,
  bytes: Uint8Array,
  profile: ProfileInput | null = null,
): string {
  const h = createHash('sha256').update(`${context}\n${fileName}\n`).update(bytes);
  // A session with a profile depends on that file's bytes (or on why it could not be read).
  if (profile !== null) {
    h.update(`\nprofile\n${profile.name}\n`);
    if ('bytes' in profile) h.update(profile.bytes);
    else h.update(JSON.stringify(profile.problem));
  }
  return h.digest('hex');
}
