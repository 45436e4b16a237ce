/**
 * A paged index in real headless Chromium: the demo sessions built with four sessions to a
 * page, so the index of pages and the pages of sessions are the ones a large archive gets.
 * Each loads with no console error, axe-core finds no serious accessibility problem, nothing
 * widens a 400 px screen, and a page prints to PDF.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildSite } from '../src/build.js';
import { loadCatalog } from '../src/lines/load.js';
import { optionsFor, tempDir } from './build/helpers.js';
import { chromiumAvailable, launchChromium } from './helpers/chromium.js';

const available = chromiumAvailable;

describe.skipIf(!available)('paged index in headless Chromium', () => {
  let browser: Browser;
  const site = join(tempDir('ll-paged-browser-'), 'site');
  let pages: string[] = [];
  beforeAll(async () => {
    const loaded = loadCatalog();
    if (!loaded.ok) throw new Error('the bundled catalog does not load');
    await buildSite(
      optionsFor(resolve('data/sessions'), site, { cacheDir: null, jobs: 1, indexPageSize: 4 }),
      loaded.value,
    );
    pages = ['index.html', ...readdirSync(site).filter((n) => /^page-\d+\.html$/.test(n))];
    browser = await launchChromium();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('has an index of pages and pages that pass axe and fit a phone', async () => {
    expect(pages.length).toBeGreaterThanOrEqual(3);
    for (const page of pages) {
      const url = pathToFileURL(join(site, page)).href;
      const tab = await browser.newPage({ viewport: { width: 1100, height: 900 }, bypassCSP: true });
      const errors: string[] = [];
      tab.on('console', (m) => {
        if (m.type() === 'error') errors.push(m.text());
      });
      tab.on('requestfailed', (r) => errors.push(`failed: ${r.url()}`));
      await tab.goto(url);
      expect(errors).toEqual([]);
      // axe-core is injected into the test browser only, never into the site.
      await tab.addScriptTag({ content: readFileSync(resolve('node_modules/axe-core/axe.min.js'), 'utf8') });
      const violations = await tab.evaluate(async () => {
        const w = globalThis as unknown as {
          axe: { run: () => Promise<{ violations: { id: string; impact: string }[] }> };
        };
        const r = await w.axe.run();
        return r.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical').map((v) => v.id);
      });
      expect({ page, violations }).toEqual({ page, violations: [] });
      await tab.close();

      const phone = await browser.newPage({ viewport: { width: 400, height: 800 } });
      await phone.goto(url);
      const width = await phone.evaluate(
        () =>
          (globalThis as unknown as { document: { documentElement: { scrollWidth: number } } }).document
            .documentElement.scrollWidth,
      );
      expect({ page, width: width <= 400 }).toEqual({ page, width: true });
      await phone.close();
    }
  });

  it('prints a page of sessions to PDF', async () => {
    const tab = await browser.newPage();
    await tab.goto(pathToFileURL(join(site, 'page-1.html')).href);
    const pdf = await tab.pdf({ format: 'A4', printBackground: false });
    expect(pdf.toString('latin1').startsWith('%PDF-')).toBe(true);
    await tab.close();
  });
});
