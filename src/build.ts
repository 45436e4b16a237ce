/**
 * Folder of sessions → site. The orchestration: the read edge (session files, catalog,
 * templates), the pure stages per session, the render stage, then the atomic write edge.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Diagnostic } from './diagnostics.js';
import type { Catalog } from './lines/types.js';
import { runSession, type SessionOutcome } from './pipeline.js';
import { renderSite, type SiteFile, type SiteSettings } from './report/site.js';
import { compileTemplates, type Templates } from './report/templates.js';
import type { InstrumentSpec } from './session/types.js';
import { writeSiteAtomically } from './write/writeSite.js';

export interface BuildOptions {
  inputDir: string;
  outDir: string;
  settings: SiteSettings;
  /** lineledger.yaml's default_instrument, inherited by sessions that give none. */
  instrumentDefaults?: InstrumentSpec | null;
  programVersion: string;
  /** SOURCE_DATE_EPOCH, when the environment sets it. */
  sourceDateEpoch: string | undefined;
}

export interface BuildReport {
  outcomes: SessionOutcome[];
  files: SiteFile[];
  failed: number;
}

export function templatesDir(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', 'templates');
}

export function loadTemplates(dir: string = templatesDir()): Templates {
  const read = (name: string) => readFileSync(join(dir, name), 'utf8');
  return compileTemplates({
    layout: read('layout.hbs'),
    index: read('index.hbs'),
    session: read('session.hbs'),
    css: read('style.css'),
  });
}

export function listSessionFiles(dir: string): string[] {
  return readdirSync(dir)
    .filter((n) => /\.ya?ml$/i.test(n) && statSync(join(dir, n)).isFile())
    .sort()
    .map((n) => join(dir, n));
}

/** A session id may be used once per archive; later files with the same id fail. */
function rejectDuplicateIds(outcomes: SessionOutcome[]): SessionOutcome[] {
  const seen = new Map<string, string>();
  return outcomes.map((o) => {
    if (!o.ok) return o;
    const first = seen.get(o.session.id);
    if (first === undefined) {
      seen.set(o.session.id, o.file);
      return o;
    }
    const diagnostic: Diagnostic = {
      file: o.file,
      line: 1,
      col: 1,
      severity: 'error',
      code: 'duplicate-id',
      field: 'id',
      message: `session id "${o.session.id}" is already used by ${first.replace(/^.*[\\/]/, '')}`,
      hint: 'give this session its own id: (lower-case letters, digits and dashes)',
    };
    return { ok: false, file: o.file, session: o.session, diagnostics: [diagnostic] };
  });
}

export function builtOnFromEpoch(epoch: string | undefined): string | null {
  if (!epoch || !/^\d+$/.test(epoch)) return null;
  return new Date(Number(epoch) * 1000).toISOString().slice(0, 10);
}

export async function buildSite(
  options: BuildOptions,
  catalog: Catalog,
  templates: Templates = loadTemplates(),
): Promise<BuildReport> {
  const paths = listSessionFiles(options.inputDir);
  const inputs = paths.map((p) => ({ path: p, bytes: readFileSync(p) }));
  const outcomes = rejectDuplicateIds(
    inputs.map((i) =>
      runSession(i.path, i.bytes, catalog, { instrumentDefaults: options.instrumentDefaults ?? null }),
    ),
  );
  const files = await renderSite({
    outcomes: outcomes.map((outcome, k) => ({
      outcome,
      text: (inputs[k] as { bytes: Buffer }).bytes.toString('utf8'),
    })),
    catalog,
    templates,
    settings: options.settings,
    programVersion: options.programVersion,
    buildOptions: 'lineledger build (default options)',
    builtOn: builtOnFromEpoch(options.sourceDateEpoch),
  });
  writeSiteAtomically(options.outDir, files);
  return { outcomes, files, failed: outcomes.filter((o) => !o.ok).length };
}
