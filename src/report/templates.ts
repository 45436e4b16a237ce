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

export function compileTemplates(t: TemplateTexts): Templates {
  const hb = Handlebars.create();
  const opts = { strict: false, noEscape: false };
  return {
    layout: hb.compile(t.layout, opts),
    index: hb.compile(t.index, opts),
    session: hb.compile(t.session, opts),
    css: t.css,
  };
}
