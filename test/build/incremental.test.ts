/** The cache: a rebuild from it equals a clean build byte for byte and recomputes only what changed. */
import {
  appendFileSync,
  existsSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSite } from '../../src/build.js';
import { loadCatalog } from '../../src/lines/load.js';
import { markdownKey } from '../../src/report/markdown.js';
import { archive, fingerprints, optionsFor, snapshot, tempDir } from './helpers.js';

const loaded = loadCatalog();
if (!loaded.ok) throw new Error('the bundled catalog does not load');
const catalog = loaded.value;

/** The cache's session entries (each has a head and, beside it, its files). */
const heads = (cacheDir: string) =>
  readdirSync(join(cacheDir, 'sessions')).filter((n) => n.endsWith('.json') && !n.endsWith('.files.json'));

describe('incremental build', () => {
  const { dir, files } = archive(9);
  const root = tempDir('ll-inc-');
  const cacheDir = join(root, 'cache');
  const cached = join(root, 'site');

  it('builds from the cache what it built before, identical to a clean build', async () => {
    const before = fingerprints(files);
    const clean = join(root, 'clean');
    const first = await buildSite(optionsFor(dir, clean, { cacheDir: null, jobs: 1 }), catalog);
    expect(first.computed).toBe(9);
    expect(existsSync(join(root, '.lineledger-cache'))).toBe(false);

    const cold = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(cold).toMatchObject({ cached: 0, computed: 9 });
    expect(heads(cacheDir)).toHaveLength(9);
    const inode = statSync(join(cached, 'index.html')).ino;
    const warm = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(warm).toMatchObject({ cached: 9, computed: 0, unchanged: true });
    // Nothing changed, so the site was left in place rather than swapped.
    expect(statSync(join(cached, 'index.html')).ino).toBe(inode);
    expect(warm.sessions.every((s) => s.ms === null)).toBe(true);
    expect(snapshot(cached)).toEqual(snapshot(clean));
    // With the site gone, the cached sessions' files are written from the cache.
    rmSync(cached, { recursive: true });
    const fromCache = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(fromCache).toMatchObject({ cached: 9, computed: 0, unchanged: false });
    expect(snapshot(cached)).toEqual(snapshot(clean));
    // The sources are only ever read.
    expect(fingerprints(files)).toEqual(before);
  });

  it('recomputes only a touched session, and the result still equals a clean build', async () => {
    const css = statSync(join(cached, 'style.css')).ino;
    appendFileSync(files[4] as string, '# a comment changes the bytes, so the key\n');
    const touched = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(touched).toMatchObject({ cached: 8, computed: 1, unchanged: false });
    // Unchanged files are carried over by hard link, not written again.
    expect(statSync(join(cached, 'style.css')).ino).toBe(css);
    expect(touched.sessions.filter((s) => s.ms !== null).map((s) => s.file)).toEqual([files[4]]);
    const clean = join(root, 'clean2');
    await buildSite(optionsFor(dir, clean, { cacheDir: null, jobs: 1 }), catalog);
    expect(snapshot(cached)).toEqual(snapshot(clean));
    // The old entry of the touched session is pruned: the cache stays the archive's size.
    expect(heads(cacheDir)).toHaveLength(9);
    // The manifest written after the patch vouches for every file: the next build changes nothing.
    const again = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(again).toMatchObject({ cached: 9, computed: 0, unchanged: true });
  });

  it('puts back a site file that was edited by hand, even when no session changed', async () => {
    const page = join(cached, 'sessions', 'tube-b-2026-03-14-a0000', 'index.html');
    const before = snapshot(cached);
    writeFileSync(page, 'edited\n');
    const again = await buildSite(optionsFor(dir, cached, { cacheDir, jobs: 1 }), catalog);
    expect(again).toMatchObject({ cached: 9, unchanged: false });
    expect(snapshot(cached)).toEqual(before);
  });

  it('recomputes everything when a setting that shapes a page changes', async () => {
    const retitled = await buildSite(
      optionsFor(dir, cached, {
        cacheDir,
        jobs: 1,
        settings: { title: 'Other', owner: null, introMarkdown: '' },
      }),
      catalog,
    );
    expect(retitled).toMatchObject({ cached: 0, computed: 9 });
    expect(snapshot(cached).get('sessions/tube-b-2026-03-14-a0000/index.html')).toContain('— Other</title>');
  });

  it('refuses a cache folder that is not a cache, and leaves it alone', async () => {
    await expect(buildSite(optionsFor(dir, cached, { cacheDir: dir, jobs: 1 }), catalog)).rejects.toThrow(
      /not a lineledger cache/,
    );
    expect(fingerprints(files)).toHaveLength(9);
  });

  it('treats a damaged cache entry as a miss', async () => {
    for (const e of heads(cacheDir).slice(0, 3)) rmSync(join(cacheDir, 'sessions', e));
    const again = await buildSite(
      optionsFor(dir, cached, {
        cacheDir,
        jobs: 1,
        settings: { title: 'Other', owner: null, introMarkdown: '' },
      }),
      catalog,
    );
    expect(again).toMatchObject({ cached: 6, computed: 3 });
  });

  it('keeps rendered Markdown in the cache and uses it while the text is the same', async () => {
    const small = archive(3);
    const where = tempDir('ll-md-');
    const mdCache = join(where, 'cache');
    const site = join(where, 'site');
    const options = optionsFor(small.dir, site, { cacheDir: mdCache, jobs: 1 });
    await buildSite(options, catalog);
    const fragments = join(mdCache, 'charts');
    const introFile = `${markdownKey(options.settings.introMarkdown)}.html`;
    // The introduction and the sessions' notes, each once.
    const md = readdirSync(fragments).filter((n) => n.startsWith('md-') && n.endsWith('.html'));
    expect(md).toContain(introFile);
    expect(md.length).toBeGreaterThan(1);
    // A stored fragment stands for its text (the cache is emptied when the program changes):
    // marked, it is what the next build puts on the page, and it survives the cache's pruning.
    writeFileSync(join(fragments, introFile), '<p>from the cache</p>');
    appendFileSync(small.files[0] as string, '# touched\n');
    await buildSite(options, catalog);
    expect(readFileSync(join(site, 'index.html'), 'utf8')).toContain('<p>from the cache</p>');
    expect(readdirSync(fragments)).toEqual(expect.arrayContaining(md));
  });
});
