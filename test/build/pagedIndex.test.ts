/**
 * A large archive's index: pages of sessions that between them link every built session
 * exactly once, an index of those pages, and an overview computed from the sessions' small
 * summaries (index rows and overview entries), never from their results.
 */
import { appendFileSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSite, loadTemplates } from '../../src/build.js';
import { loadCatalog } from '../../src/lines/load.js';
import {
  type IndexRow,
  indexFiles,
  indexPagePath,
  type OverviewEntry,
  type RenderContext,
  SESSIONS_PER_PAGE,
} from '../../src/report/site.js';
import { archive, optionsFor, snapshot, tempDir } from './helpers.js';

const loaded = loadCatalog();
if (!loaded.ok) throw new Error('the bundled catalog does not load');
const catalog = loaded.value;

/** The session links inside the sessions table of a page (not the nav, not the overview). */
function tableLinks(html: string): string[] {
  const table = /<table class="runs">[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
  return [...table.matchAll(/<a class="title" href="(sessions\/[^"]+\/index\.html)"/g)].map(
    (m) => m[1] as string,
  );
}

describe('paged index of a large archive', () => {
  const count = 300;
  const { dir } = archive(count);
  const out = join(tempDir('ll-paged-'), 'site');

  it('links every built session exactly once across its pages, and the index links every page', async () => {
    const report = await buildSite(optionsFor(dir, out, { cacheDir: null, jobs: 1 }), catalog);
    const built = report.sessions.filter((s) => s.ok).map((s) => `sessions/${s.id}/index.html`);
    expect(built.length).toBeGreaterThan(SESSIONS_PER_PAGE);

    const pageCount = Math.ceil(report.sessions.length / SESSIONS_PER_PAGE);
    const pageFiles = readdirSync(out).filter((n) => /^page-\d+\.html$/.test(n));
    expect(pageFiles.sort()).toEqual(
      Array.from({ length: pageCount }, (_, i) => indexPagePath(i + 1)).sort(),
    );

    const linked: string[] = [];
    for (let n = 1; n <= pageCount; n++) {
      const html = readFileSync(join(out, indexPagePath(n)), 'utf8');
      const links = tableLinks(html);
      expect(links.length).toBeLessThanOrEqual(SESSIONS_PER_PAGE);
      linked.push(...links);
      // Each page leads back to the index and on to its neighbours.
      expect(html).toContain('href="index.html"');
      if (n > 1) expect(html).toContain(`href="${indexPagePath(n - 1)}" rel="prev"`);
      if (n < pageCount) expect(html).toContain(`href="${indexPagePath(n + 1)}" rel="next"`);
    }
    expect(linked.sort()).toEqual([...built].sort());
    expect(new Set(linked).size).toBe(linked.length);

    const index = readFileSync(join(out, 'index.html'), 'utf8');
    // The index holds no sessions table: it would grow with the archive.
    expect(index).not.toContain('<table class="runs">');
    for (let n = 1; n <= pageCount; n++) expect(index).toContain(`href="${indexPagePath(n)}"`);

    // Its overview agrees with the results themselves (read here, by the test only): each
    // species with the number of sessions whose explanation names it, written as the result's
    // display names ([O III]).
    const fromResults = new Map<string, number>();
    for (const id of readdirSync(join(out, 'sessions'))) {
      const result = JSON.parse(readFileSync(join(out, 'sessions', id, 'result.json'), 'utf8')) as {
        explanation: { species: string[]; display: string[] };
      };
      for (const s of result.explanation.display) fromResults.set(s, (fromResults.get(s) ?? 0) + 1);
    }
    const fromIndex = new Map(
      [...index.matchAll(/<tr><th scope="row">([^<]+)<\/th><td>(\d+)<\/td>/g)].map((m) => [
        (m[1] as string).replace(/&#x27;/g, "'"),
        Number(m[2]),
      ]),
    );
    expect(fromIndex.size).toBeGreaterThan(0);
    expect(fromIndex).toEqual(fromResults);
  });

  it('renders again only the pages whose sessions changed, and gives what a clean build gives', async () => {
    const small = archive(25);
    const root = tempDir('ll-pages-');
    const site = join(root, 'site');
    const cacheDir = join(root, 'cache');
    const options = optionsFor(small.dir, site, { cacheDir, jobs: 1, indexPageSize: 5 });
    const first = await buildSite(options, catalog);
    // style.css, index.html and five pages of five sessions.
    expect(first.indexPagesRendered).toBe(7);
    // A comment changes the session's bytes (it is computed again) but not its row: no page changes.
    appendFileSync(small.files[12] as string, '# touched\n');
    expect((await buildSite(options, catalog)).indexPagesRendered).toBe(2);
    // A new title changes its row, and so its page.
    const touched = small.files[12] as string;
    writeFileSync(touched, readFileSync(touched, 'utf8').replace(/^title: (.*)$/m, 'title: $1, retitled'));
    const second = await buildSite(options, catalog);
    // The stylesheet and the home page are always rendered; of the pages only the touched one.
    expect(second.indexPagesRendered).toBe(3);
    const clean = join(root, 'clean');
    await buildSite(optionsFor(small.dir, clean, { cacheDir: null, jobs: 1, indexPageSize: 5 }), catalog);
    expect(snapshot(site)).toEqual(snapshot(clean));
    // A page edited by hand is not vouched for: it is rendered and written afresh.
    const page = join(site, indexPagePath(1));
    writeFileSync(page, 'edited');
    const third = await buildSite(options, catalog);
    expect(third.indexPagesRendered).toBe(3);
    expect(readFileSync(page, 'utf8')).toBe(readFileSync(join(clean, indexPagePath(1)), 'utf8'));
  });

  it('computes the overview from the summaries alone (no session or result exists)', () => {
    const ctx: RenderContext = {
      catalog,
      templates: loadTemplates(),
      settings: { title: 'Summaries only', owner: null, introMarkdown: '' },
      programVersion: '0.0.0-test',
      buildOptions: 'test',
      builtOn: null,
    };
    // 250 invented rows over two years; every third finds X I, every fifth Y II.
    const rows: IndexRow[] = [];
    const overview: OverviewEntry[] = [];
    for (let i = 0; i < 250; i++) {
      const id = `s-${String(i).padStart(3, '0')}`;
      const date = `${2024 + Math.floor(i / 125)}-0${1 + (i % 9)}-1${i % 10}`;
      rows.push({
        sortKey: date,
        date,
        title: `Session ${id}`,
        file: `${id}.yaml`,
        href: `sessions/${id}/index.html`,
        source: 'lamp',
        explanation: 'invented',
        confidence: '—',
        status: i % 7 === 0 ? 'ambiguous' : 'identified',
        diagnostics: [],
        lines: [],
        id,
      });
      if (i % 3 === 0) overview.push({ session: id, species: 'X I', display: 'X I' });
      // A forbidden species is shown in brackets, as everywhere else.
      if (i % 5 === 0) overview.push({ session: id, species: 'Y II', display: '[Y II]' });
    }
    const files = [...indexFiles(rows, overview, ctx, '')];
    expect(files.map((f) => f.path)).toEqual([
      'style.css',
      'index.html',
      'page-1.html',
      'page-2.html',
      'page-3.html',
    ]);
    const index = (files[1] as { contents: string }).contents;
    expect(index).toMatch(/<th scope="row">X I<\/th><td>84<\/td>/);
    expect(index).toMatch(/<th scope="row">\[Y II\]<\/th><td>50<\/td>/);
    const ambiguous = rows.filter((r) => r.status === 'ambiguous').length;
    expect(index).toContain(`250 sessions: ${250 - ambiguous} identified, ${ambiguous} ambiguous`);
    // Each page lists its own sessions by species: page 1 holds the first 100 in time order.
    const page1 = (files[2] as { contents: string }).contents;
    expect(tableLinks(page1)).toHaveLength(100);
    expect(page1).toContain('Sessions by species on this page');
  });
});
