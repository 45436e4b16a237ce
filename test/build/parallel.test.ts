/** Worker threads: a parallel build writes the same bytes as a serial one. */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildSite } from '../../src/build.js';
import { loadCatalog } from '../../src/lines/load.js';
import { autoJobs, SERIAL_BELOW } from '../../src/parallel/pool.js';
import { archive, optionsFor, snapshot, tempDir } from './helpers.js';

const loaded = loadCatalog();
if (!loaded.ok) throw new Error('the bundled catalog does not load');
const catalog = loaded.value;

describe('parallel build', () => {
  it('gives the same site on 2 and 3 threads as serially, failures and duplicate ids included', async () => {
    const { dir } = archive(8);
    const { writeFileSync } = await import('node:fs');
    writeFileSync(join(dir, '0100-broken.yaml'), 'lineledger: 1\nlines:\n  - { wavelength: 500\n');
    writeFileSync(
      join(dir, '0101-same-id.yaml'),
      'lineledger: 1\nid: tube-b-2026-03-14-a0000\nlines:\n  - wavelength: 500\n',
    );
    const root = tempDir('ll-par-');
    const serial = await buildSite(
      optionsFor(dir, join(root, 'serial'), { cacheDir: null, jobs: 1 }),
      catalog,
    );
    const parallel = await buildSite(
      optionsFor(dir, join(root, 'parallel'), { cacheDir: null, jobs: 2 }),
      catalog,
    );
    expect(parallel.jobs).toBe(2);
    expect(serial.jobs).toBe(1);
    expect(parallel.failed).toBe(2);
    expect(parallel.sessions.map((s) => [s.file, s.status, s.diagnostics.map((d) => d.code)])).toEqual(
      serial.sessions.map((s) => [s.file, s.status, s.diagnostics.map((d) => d.code)]),
    );
    expect(parallel.sessions.find((s) => s.file.endsWith('same-id.yaml'))?.diagnostics[0]?.code).toBe(
      'duplicate-id',
    );
    const a = snapshot(join(root, 'serial'));
    expect(a.size).toBe(1 + 1 + 8 * 4);
    expect(snapshot(join(root, 'parallel'))).toEqual(a);
    // This thread and two workers, each holding queued sessions.
    const three = await buildSite(optionsFor(dir, join(root, 'three'), { cacheDir: null, jobs: 3 }), catalog);
    expect(three.jobs).toBe(3);
    expect(three.sessions.map((s) => [s.file, s.status])).toEqual(
      serial.sessions.map((s) => [s.file, s.status]),
    );
    expect(snapshot(join(root, 'three'))).toEqual(a);
  });

  it('fills the cache from the render thread so that a serial rebuild reuses it, same bytes', async () => {
    const { dir } = archive(5);
    const root = tempDir('ll-par-cache-');
    const cacheDir = join(root, 'cache');
    const first = await buildSite(optionsFor(dir, join(root, 'split'), { cacheDir, jobs: 2 }), catalog);
    expect(first.jobs).toBe(2);
    const again = await buildSite(optionsFor(dir, join(root, 'again'), { cacheDir, jobs: 1 }), catalog);
    expect(again.sessions.every((s) => s.status !== 'failed')).toBe(true);
    expect(snapshot(join(root, 'again'))).toEqual(snapshot(join(root, 'split')));
  });

  it('stays serial for a handful of sessions and on one core, splits the stages on two, else one thread per core but one', () => {
    expect(autoJobs(SERIAL_BELOW - 1, 4)).toBe(1);
    expect(autoJobs(500, 1)).toBe(1);
    expect(autoJobs(500, 2)).toBe(2);
    expect(autoJobs(500, 3)).toBe(2);
    expect(autoJobs(500, 8)).toBe(7);
  });
});
