/** Every page of the committed demo site is valid HTML (html-validate, its recommended rules). */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { HtmlValidate } from 'html-validate';
import { describe, expect, it } from 'vitest';

const SITE = 'site';
const pages = ['index.html', ...readdirSync(join(SITE, 'sessions')).map((id) => `sessions/${id}/index.html`)];

const validator = new HtmlValidate({
  extends: ['html-validate:recommended'],
  rules: {
    // Vega's inline SVG writes numbers and attributes its own way; these rules are about HTML authoring style.
    'no-inline-style': 'off',
    'attribute-boolean-style': 'off',
    'no-trailing-whitespace': 'off',
    'long-title': 'off',
  },
});

describe('valid HTML', () => {
  it.each(pages)('%s', async (page) => {
    const report = await validator.validateString(readFileSync(join(SITE, page), 'utf8'), page);
    const messages = report.results.flatMap((r) =>
      r.messages.map((m) => `${m.line}:${m.column} ${m.ruleId}: ${m.message}`),
    );
    expect(messages).toEqual([]);
  });
});
