/**
 * Every page of the committed demo site is valid HTML (html-validate, its recommended rules),
 * and so are the index of pages and the pages of sessions a large archive gets.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { HtmlValidate } from 'html-validate';
import { describe, expect, it } from 'vitest';
import { buildSite } from '../src/build.js';
import { loadCatalog } from '../src/lines/load.js';
import { optionsFor, tempDir } from './build/helpers.js';

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

describe('valid HTML of a paged index', () => {
  it('index.html and every page of sessions (demo sessions, four to a page)', async () => {
    const loaded = loadCatalog();
    if (!loaded.ok) throw new Error('the bundled catalog does not load');
    const site = join(tempDir('ll-paged-valid-'), 'site');
    await buildSite(
      optionsFor(resolve('data/sessions'), site, { cacheDir: null, jobs: 1, indexPageSize: 4 }),
      loaded.value,
    );
    const paged = ['index.html', ...readdirSync(site).filter((n) => /^page-\d+\.html$/.test(n))];
    expect(paged.length).toBeGreaterThanOrEqual(3);
    for (const page of paged) {
      const report = await validator.validateString(readFileSync(join(site, page), 'utf8'), page);
      const messages = report.results.flatMap((r) =>
        r.messages.map((m) => `${page} ${m.line}:${m.column} ${m.ruleId}: ${m.message}`),
      );
      expect(messages).toEqual([]);
    }
  });
});
