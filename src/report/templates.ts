/** Handlebars templates, compiled once from the text the read edge loaded. */
import Handlebars from 'handlebars';

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

export function compileTemplates(t: TemplateTexts): Templates {
  // Handlebars compiles a template on its first use (about 60–90 ms for the session page on
  // the project's machine); a rebuild in the same process with the same texts need not again.
  if (last && sameTexts(last.texts, t)) return last.templates;
  const hb = Handlebars.create();
  const opts = { strict: false, noEscape: false };
  const templates = {
    layout: hb.compile(t.layout, opts),
    index: hb.compile(t.index, opts),
    session: hb.compile(t.session, opts),
    css: t.css,
  };
  last = { texts: { ...t }, templates };
  return templates;
}
