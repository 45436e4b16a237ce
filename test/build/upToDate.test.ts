/**
 * The up-to-date stamp: `build` with nothing changed repeats the last report and leaves the
 * site alone; any change to what a build reads or is asked for builds again, and the result
 * is the site a build from scratch gives.
 */
import { spawnSync } from 'node:child_process';
import { appendFileSync, existsSync, readFileSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { archive, CLI, snapshot, tempDir } from './helpers.js';

const SKIPPED = 'nothing changed since the last build';

function build(cwd: string, args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [CLI, 'build', ...args, '--verbose', '--jobs', '1'], {
    cwd,
    encoding: 'utf8',
    env: { ...process.env, SOURCE_DATE_EPOCH: '', ...env },
  });
  return { code: r.status, err: r.stderr, skipped: r.stderr.includes(SKIPPED) };
}

describe('up-to-date stamp', () => {
  const { dir, files } = archive(3);
  const root = tempDir('ll-stamp-');
  const out = join(root, 'site');
  const stamp = join(root, '.lineledger-cache', 'site', 'up-to-date.json');
  writeFileSync(join(root, 'lineledger.yaml'), 'lineledger-project: 1\ntitle: Stamp test\n');
  const args = [dir, '--out', out];

  it('skips a build when nothing changed, and builds again after each kind of change', () => {
    const first = build(root, args);
    expect(first.code, first.err).toBe(0);
    expect(first.skipped).toBe(false);
    expect(existsSync(stamp)).toBe(true);
    const index = statSync(join(out, 'index.html'));
    const site = snapshot(out);

    const again = build(root, args);
    expect(again.code, again.err).toBe(0);
    expect(again.skipped).toBe(true);
    expect(again.err).toContain('built 3 of 3 sessions');
    expect(statSync(join(out, 'index.html')).ctimeMs).toBe(index.ctimeMs);
    expect(snapshot(out)).toEqual(site);

    // A session edited: built again, then skipped again.
    appendFileSync(files[1] as string, '# edited\n');
    const edited = build(root, args);
    expect(edited.skipped).toBe(false);
    expect(edited.err).toContain('1 computed');
    expect(build(root, args).skipped).toBe(true);

    // A session added.
    writeFileSync(
      join(dir, 'zz-new.yaml'),
      readFileSync(files[0] as string, 'utf8').replace(/^id: .*$/m, ''),
    );
    expect(build(root, args).skipped).toBe(false);
    expect(build(root, args).skipped).toBe(true);
    unlinkSync(join(dir, 'zz-new.yaml'));
    expect(build(root, args).skipped).toBe(false);

    // The config edited: its new title is in the site.
    writeFileSync(join(root, 'lineledger.yaml'), 'lineledger-project: 1\ntitle: Renamed archive\n');
    expect(build(root, args).skipped).toBe(false);
    expect(readFileSync(join(out, 'index.html'), 'utf8')).toContain('Renamed archive');

    // Other options or another build date.
    expect(build(root, [...args, '--title', 'Flag title']).skipped).toBe(false);
    expect(build(root, [...args, '--title', 'Flag title']).skipped).toBe(true);
    expect(build(root, [...args, '--title', 'Flag title'], { SOURCE_DATE_EPOCH: '1780000000' }).skipped).toBe(
      false,
    );
  });

  it('writes a site file edited by hand afresh rather than vouching for it', () => {
    build(root, args);
    expect(build(root, args).skipped).toBe(true);
    const css = join(out, 'style.css');
    const original = readFileSync(css, 'utf8');
    writeFileSync(css, 'body { color: red }\n');
    const r = build(root, args);
    expect(r.skipped).toBe(false);
    expect(readFileSync(css, 'utf8')).toBe(original);
  });

  it('repeats the problems of the last build and its exit code when skipping', () => {
    writeFileSync(join(dir, 'broken.yaml'), 'lineledger: 1\nlines:\n  - { wavelength: 500\n');
    const failed = build(root, args);
    expect(failed.code).toBe(1);
    expect(failed.skipped).toBe(false);
    const skipped = build(root, args);
    expect(skipped.skipped).toBe(true);
    expect(skipped.code).toBe(1);
    expect(skipped.err).toContain('broken.yaml');
    expect(skipped.err).toContain('1 failed');
    unlinkSync(join(dir, 'broken.yaml'));
  });

  it('writes no stamp while a named profile is missing (creating it must rebuild)', () => {
    writeFileSync(
      join(dir, 'with-profile.yaml'),
      'lineledger: 1\nprofile:\n  file: later.csv\nlines:\n  - wavelength: 500\n',
    );
    build(root, args);
    expect(existsSync(stamp)).toBe(false);
    expect(build(root, args).skipped).toBe(false);
    unlinkSync(join(dir, 'with-profile.yaml'));
    build(root, args);
    expect(build(root, args).skipped).toBe(true);
  });

  it('never skips with --no-cache, and notices the site a --no-cache build swapped in', () => {
    build(root, args);
    expect(build(root, [...args, '--no-cache']).skipped).toBe(false);
    expect(build(root, args).skipped).toBe(false);
    expect(existsSync(stamp)).toBe(true);
  });
});
