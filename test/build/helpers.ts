/** Shared by the build tests: snapshots of folders, a generated archive, the catalog. */
import { createHash } from 'node:crypto';
import { mkdtempSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { makeArchive } from '../../scripts/make-archive.js';
import type { BuildOptions } from '../../src/build.js';
import { loadConfig } from '../../src/commands/common.js';

/** The compiled program, as `npm test` builds it before the tests. */
export const DIST = join(process.cwd(), 'dist');
export const CLI = join(DIST, 'cli.js');

/** Every file under dir (relative path → contents), for byte-for-byte comparisons. */
export function snapshot(dir: string): Map<string, string> {
  const out = new Map<string, string>();
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.set(relative(dir, p), readFileSync(p, 'utf8'));
    }
  };
  walk(dir);
  return out;
}

/** Hash and mtime of each file, to show a build only ever reads its sources. */
export function fingerprints(files: readonly string[]): string[] {
  return files.map(
    (f) => `${f} ${statSync(f).mtimeMs} ${createHash('sha256').update(readFileSync(f)).digest('hex')}`,
  );
}

export function tempDir(prefix: string): string {
  return mkdtempSync(join(tmpdir(), prefix));
}

export function archive(count: number): { dir: string; files: string[] } {
  const dir = join(tempDir('ll-archive-'), 'sessions');
  return { dir, files: makeArchive(dir, count) };
}

/** Options as `lineledger build` gives them for the demo config (its default instrument). */
export function optionsFor(
  inputDir: string,
  outDir: string,
  extra: Partial<BuildOptions> = {},
): BuildOptions {
  const config = loadConfig('lineledger.yaml');
  return {
    inputDir,
    outDir,
    settings: { title: config.title, owner: config.owner, introMarkdown: config.introMarkdown },
    instrumentDefaults: config.defaultInstrument,
    programVersion: '0.0.0-test',
    sourceDateEpoch: undefined,
    ...extra,
  };
}
