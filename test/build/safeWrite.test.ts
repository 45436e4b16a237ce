/** Nothing lost: a killed or failing build leaves the previous site byte for byte as it was. */
import { type ChildProcess, spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readManifest, verifiedFiles, writeManifest } from '../../src/write/manifest.js';
import { hasLeftovers } from '../../src/write/swap.js';
import { openStaging, writeSiteAtomically } from '../../src/write/writeSite.js';
import { archive, CLI, fingerprints, snapshot, tempDir } from './helpers.js';

const stagingOf = (parent: string) => readdirSync(parent).filter((n) => n.startsWith('.site.building-'));

function exited(child: ChildProcess): Promise<NodeJS.Signals | null> {
  return new Promise((resolve) => child.on('exit', (_code, signal) => resolve(signal)));
}

/** A process id that is certainly not running: one of a child that has exited. */
function deadPid(): number {
  return spawnSync(process.execPath, ['-e', '0']).pid as number;
}

describe('killed build', () => {
  it('leaves the previous site intact when killed while staging, and the next build cleans up', async () => {
    const { dir, files } = archive(24);
    const parent = tempDir('ll-kill-');
    const out = join(parent, 'site');
    const first = spawnSync(process.execPath, [CLI, 'build', dir, '--out', out, '--jobs', '1'], {
      encoding: 'utf8',
    });
    expect(first.status, first.stderr).toBe(0);
    const before = snapshot(out);
    const sources = fingerprints(files);

    // A different title, no cache: a slow build whose output would differ from the old site.
    const child = spawn(
      process.execPath,
      [CLI, 'build', dir, '--out', out, '--title', 'Changed', '--no-cache', '--jobs', '1'],
      { stdio: 'ignore' },
    );
    const done = exited(child);
    let staged = '';
    const deadline = Date.now() + 60_000;
    while (Date.now() < deadline) {
      const s = stagingOf(parent)[0];
      // Wait for a few sessions to be written into the staging folder, then kill.
      if (
        s &&
        existsSync(join(parent, s, 'sessions')) &&
        readdirSync(join(parent, s, 'sessions')).length >= 3
      ) {
        staged = s;
        break;
      }
      await new Promise((r) => setTimeout(r, 20));
    }
    child.kill('SIGKILL');
    expect(await done).toBe('SIGKILL');
    expect(staged).not.toBe('');
    expect(existsSync(join(parent, staged))).toBe(true);
    expect(snapshot(out)).toEqual(before);

    const next = spawnSync(process.execPath, [CLI, 'build', dir, '--out', out, '--jobs', '1'], {
      encoding: 'utf8',
    });
    expect(next.status, next.stderr).toBe(0);
    expect(stagingOf(parent)).toEqual([]);
    expect(snapshot(out)).toEqual(before);
    expect(fingerprints(files)).toEqual(sources);
  });
});

describe('write edge', () => {
  const site = [
    { path: 'index.html', contents: '<p>new</p>\n' },
    { path: 'sessions/a/index.html', contents: 'a\n' },
  ];

  function oldSite(): { parent: string; out: string } {
    const parent = tempDir('ll-write-');
    const out = join(parent, 'site');
    writeSiteAtomically(out, [
      { path: 'index.html', contents: '<p>old</p>\n' },
      { path: 'sessions/x/result.json', contents: '{}\n' },
    ]);
    return { parent, out };
  }

  it('keeps the old site when a file cannot be created, and removes its staging folder', () => {
    const { parent, out } = oldSite();
    const before = snapshot(out);
    // "sessions/a" is a file, so "sessions/a/index.html" cannot be created.
    expect(() =>
      writeSiteAtomically(out, [{ path: 'sessions/a', contents: 'x' }, ...site.slice(1)]),
    ).toThrow();
    expect(snapshot(out)).toEqual(before);
    expect(readdirSync(parent)).toEqual(['site']);
  });

  it('refuses a path outside the output folder and leaves the old site', () => {
    const { out } = oldSite();
    const before = snapshot(out);
    expect(() => writeSiteAtomically(out, [{ path: '../escape.html', contents: 'x' }])).toThrow(/outside/);
    expect(snapshot(out)).toEqual(before);
  });

  it('swaps a finished site in and leaves nothing beside it', () => {
    const { parent, out } = oldSite();
    writeSiteAtomically(out, site);
    expect([...snapshot(out).keys()]).toEqual(['index.html', 'sessions/a/index.html']);
    expect(readdirSync(parent)).toEqual(['site']);
  });

  it('puts back a site a killed build had moved aside, and removes dead builds’ folders', () => {
    const { parent, out } = oldSite();
    const before = snapshot(out);
    const pid = deadPid();
    renameSync(out, join(parent, `.site.previous-${pid}`));
    mkdirSync(join(parent, `.site.building-${pid}`));
    writeFileSync(join(parent, `.site.building-${pid}`, 'half.html'), 'x');
    const staging = openStaging(out);
    expect(snapshot(out)).toEqual(before);
    staging.abort();
    expect(readdirSync(parent)).toEqual(['site']);
  });

  it('leaves the staging folder of a build that is still running', () => {
    const { parent, out } = oldSite();
    // This test's own runner process is alive: its folder must survive another build.
    const live = join(parent, `.site.building-${process.ppid}`);
    mkdirSync(live);
    writeSiteAtomically(out, site);
    expect(existsSync(live)).toBe(true);
  });
});

describe('patch in place', () => {
  // Our own toy site: ten session pages and an index, as a build's staging receives them.
  const pages = (changed: Record<string, string> = {}, dropped: string[] = []) => [
    ...Array.from({ length: 10 }, (_, i) => `sessions/s${i}/index.html`)
      .filter((p) => !dropped.includes(p))
      .map((path) => ({ path, contents: changed[path] ?? `${path}\n` })),
    { path: 'index.html', contents: changed['index.html'] ?? 'index\n' },
  ];

  /** Builds `files` into out with the manifest kept in a cache folder, as buildSite does. */
  function build(out: string, cache: string, files: ReturnType<typeof pages>): boolean {
    const manifest = join(cache, 'site-manifest.json');
    const staging = openStaging(out, { reuse: verifiedFiles(readManifest(manifest, out)) });
    staging.write(files);
    const changed = staging.commit();
    writeManifest(manifest, out, staging.hashes);
    return changed;
  }

  function fresh(): { parent: string; out: string; cache: string } {
    const parent = tempDir('ll-patch-');
    const cache = tempDir('ll-patch-cache-');
    const out = join(parent, 'site');
    build(out, cache, pages());
    return { parent, out, cache };
  }

  it('replaces only the changed files, removes what the build no longer makes, keeps the folder', () => {
    const { parent, out, cache } = fresh();
    const folder = statSync(out).ino;
    const kept = statSync(join(out, 'sessions/s5/index.html')).ino;
    const files = pages({ 'sessions/s2/index.html': 'new\n', 'index.html': 'index 2\n' }, [
      'sessions/s9/index.html',
    ]);
    expect(build(out, cache, files)).toBe(true);
    // Patched, not swapped: the same folder, the unchanged file never rewritten or relinked.
    expect(statSync(out).ino).toBe(folder);
    expect(statSync(join(out, 'sessions/s5/index.html')).ino).toBe(kept);
    expect(snapshot(out)).toEqual(new Map(files.map((f) => [f.path, f.contents])));
    // The dropped session's folder is gone, and nothing is left beside the site.
    expect(existsSync(join(out, 'sessions/s9'))).toBe(false);
    expect(readdirSync(parent)).toEqual(['site']);
  });

  it('swaps instead when a site file was edited by hand, or when much of the site changed', () => {
    const { out, cache } = fresh();
    let folder = statSync(out).ino;
    writeFileSync(join(out, 'sessions/s1/index.html'), 'edited by hand\n');
    const files = pages({ 'sessions/s2/index.html': 'new\n' });
    build(out, cache, files);
    expect(statSync(out).ino).not.toBe(folder);
    expect(snapshot(out)).toEqual(new Map(files.map((f) => [f.path, f.contents])));

    folder = statSync(out).ino;
    const many = pages(
      Object.fromEntries([0, 1, 2, 3].map((i) => [`sessions/s${i}/index.html`, `v3 ${i}\n`])),
    );
    build(out, cache, many);
    expect(statSync(out).ino).not.toBe(folder);
    expect(snapshot(out)).toEqual(new Map(many.map((f) => [f.path, f.contents])));
  });

  it('after a patch killed part-way, the next build swaps in a whole site and removes the marker', () => {
    const { parent, out, cache } = fresh();
    // What a killed patch leaves: its marker, and one file renamed in (unknown to the manifest).
    const pid = deadPid();
    writeFileSync(join(parent, `.site.patching-${pid}`), '');
    writeFileSync(join(out, 'sessions/s3/index.html'), 'half-way\n');
    expect(hasLeftovers(out)).toBe(true);
    const folder = statSync(out).ino;
    const files = pages({ 'sessions/s4/index.html': 'new\n' });
    build(out, cache, files);
    expect(statSync(out).ino).not.toBe(folder);
    expect(snapshot(out)).toEqual(new Map(files.map((f) => [f.path, f.contents])));
    expect(readdirSync(parent)).toEqual(['site']);
  });
});
