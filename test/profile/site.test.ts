/** A profile session in a built site: its record, and the profile copied byte for byte. */
import { spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSite } from '../../src/build.js';
import { optionsFor, tempDir } from '../build/helpers.js';
import { bundledCatalog } from '../helpers/catalog.js';

describe('a profile session in the site', () => {
  it('copies the FITS profile beside session.yaml, also when written from the cache, and rebuilds when it changes', async () => {
    const root = tempDir('profile-site-');
    const dir = join(root, 'sessions');
    mkdirSync(dir);
    for (const f of ['2026-06-12-star-k-fits.yaml', 'star-k-spectrum.fits'])
      copyFileSync(join('data', 'sessions', f), join(dir, f));
    const out = join(root, 'site');
    const cacheDir = join(root, 'cache');
    const catalog = bundledCatalog();
    const first = await buildSite(optionsFor(dir, out, { cacheDir, jobs: 1 }), catalog);
    expect(first.failed).toBe(0);
    const copy = join(out, 'sessions', 'star-k-2026-06-12', 'profile.fits');
    const original = readFileSync(join(dir, 'star-k-spectrum.fits'));
    expect(readFileSync(copy).equals(original)).toBe(true);
    const page = readFileSync(join(out, 'sessions', 'star-k-2026-06-12', 'index.html'), 'utf8');
    expect(page).toContain('href="profile.fits"');
    const result = JSON.parse(
      readFileSync(join(out, 'sessions', 'star-k-2026-06-12', 'result.json'), 'utf8'),
    );
    expect(result.profile.format).toBe('fits');
    expect(result.profile.lines.length).toBe(5);

    // The copy lost from the site is written again from the cache, byte for byte.
    rmSync(copy);
    const warm = await buildSite(optionsFor(dir, out, { cacheDir, jobs: 1 }), catalog);
    expect(warm.cached).toBe(1);
    expect(readFileSync(copy).equals(original)).toBe(true);

    // A changed profile is a changed session: the cache key covers the profile's bytes.
    const changed = Buffer.from(original);
    changed[changed.length - 100] = (changed[changed.length - 100] ?? 0) ^ 1;
    writeFileSync(join(dir, 'star-k-spectrum.fits'), changed);
    const again = await buildSite(optionsFor(dir, out, { cacheDir, jobs: 1 }), catalog);
    expect(again.computed).toBe(1);
    expect(readFileSync(copy).equals(changed)).toBe(true);
  });

  it('a built site with a profile copy and no build manifest (a fresh checkout) is rebuilt in place; a user file in it is kept', () => {
    const root = tempDir('profile-guard-');
    const dir = join(root, 'sessions');
    mkdirSync(dir);
    for (const f of ['2026-06-12-star-k-fits.yaml', 'star-k-spectrum.fits'])
      copyFileSync(join('data', 'sessions', f), join(dir, f));
    const out = join(root, 'site');
    // --no-cache: no manifest anywhere, as in a clone of a repository that commits its site.
    const build = () =>
      spawnSync(
        process.execPath,
        [resolve('dist/cli.js'), 'build', dir, '--out', out, '--no-cache', '--quiet'],
        {
          encoding: 'utf8',
        },
      );
    expect(build().status).toBe(0);
    expect(existsSync(join(out, 'sessions', 'star-k-2026-06-12', 'profile.fits'))).toBe(true);
    const again = build();
    expect(again.status, again.stderr).toBe(0);
    // A file the build does not write makes the folder someone's own: refused, and kept.
    const notes = join(out, 'sessions', 'star-k-2026-06-12', 'notes.txt');
    writeFileSync(notes, 'my notes\n');
    const refused = build();
    expect(refused.status).toBe(2);
    expect(refused.stderr).toMatch(/refusing the output folder/);
    expect(readFileSync(notes, 'utf8')).toBe('my notes\n');
  });
});
