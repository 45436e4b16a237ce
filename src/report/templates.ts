/**
 * Handlebars templates, compiled once from the text the read edge loaded. The bundled
 * templates are precompiled when the program is built (`node dist/precompile.js` writes
 * templates.precompiled.cjs beside this module): compiling the session page costs 55–90 ms at
 * each program start, loading its precompiled form about 2 ms. The precompiled form is used
 * only when its key (Handlebars' version and the texts) matches the texts given.
 */
import { createHash } from 'node:crypto';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type Handlebars from 'handlebars';

export interface TemplateTexts {
  layout: string;
  index: string;
  session: string;
  css: string;
}

export interface Templates {
  layout: Handlebars.TemplateDelegate;
  index: Handlebars.TemplateDelegate;
  session: Handlebars.TemplateDelegate;
  css: string;
}

/** The last texts compiled and what they gave: a watch rebuild with the same templates reuses them. */
let last: { texts: TemplateTexts; templates: Templates } | null = null;

const sameTexts = (a: TemplateTexts, b: TemplateTexts) =>
  a.layout === b.layout && a.index === b.index && a.session === b.session && a.css === b.css;

const OPTIONS = { strict: false, noEscape: false };
const PAGES = ['layout', 'index', 'session'] as const;
type Page = (typeof PAGES)[number];

/** Beside this module in dist/report/. */
export const PRECOMPILED_TEMPLATES_FILE = 'templates.precompiled.cjs';

const requireHere = createRequire(import.meta.url);
type HandlebarsModule = typeof Handlebars;
/** Handlebars' runtime (templates from precompiled specs) loads in a fraction of the full library's time. */
const runtime = () => requireHere('handlebars/runtime') as HandlebarsModule;
/** The full library (parser and compiler): only to compile a template from its text. */
const compiler = () => requireHere('handlebars') as HandlebarsModule;

export function templatesKey(t: TemplateTexts): string {
  const hash = createHash('sha256').update(`handlebars ${runtime().VERSION}\n`);
  for (const page of PAGES) hash.update(`${page}\n${t[page].length}\n`).update(t[page]);
  return hash.digest('hex');
}

/** The CommonJS module `precompile` writes: the key and each page's template spec. */
export function precompiledTemplatesSource(t: TemplateTexts): string {
  const specs = PAGES.map((page) => `  ${page}: ${compiler().precompile(t[page], OPTIONS)},`);
  return `// Written by dist/precompile.js from templates/: do not edit.\nmodule.exports = {\n  key: ${JSON.stringify(templatesKey(t))},\n${specs.join('\n')}\n};\n`;
}

type Specs = Record<Page, TemplateSpecification> & { key: string };
type TemplateSpecification = Parameters<typeof Handlebars.template>[0];

/** The precompiled specs at `file` when made from exactly these texts; null otherwise. */
export function readPrecompiledTemplates(file: string, t: TemplateTexts): Specs | null {
  try {
    const specs = requireHere(file) as Specs;
    return specs && specs.key === templatesKey(t) ? specs : null;
  } catch {
    return null;
  }
}

export function precompiledTemplatesPath(): string {
  return join(dirname(fileURLToPath(import.meta.url)), PRECOMPILED_TEMPLATES_FILE);
}

export function compileTemplates(
  t: TemplateTexts,
  precompiled: string | null = precompiledTemplatesPath(),
): Templates {
  // A rebuild in the same process with the same texts reuses what the last one compiled.
  if (last && sameTexts(last.texts, t)) return last.templates;
  const specs = precompiled === null ? null : readPrecompiledTemplates(precompiled, t);
  const hb = (specs ? runtime() : compiler()).create();
  const make = (page: Page) => (specs ? hb.template(specs[page]) : hb.compile(t[page], OPTIONS));
  const templates = { layout: make('layout'), index: make('index'), session: make('session'), css: t.css };
  last = { texts: { ...t }, templates };
  return templates;
}
