/** `lookup` and `import-nist` through the real command line: output, files and exit codes. */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseCatalog } from '../../src/lines/parse.js';

const CLI = join(process.cwd(), 'dist', 'cli.js');

function run(args: string[]) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('lineledger lookup', () => {
  it('prints the lines near 589.0 nm with Na I D2 (NIST ASD air 588.995 nm) first', () => {
    const r = run(['lookup', '589.0', '--species', 'Na I']);
    expect(r.code, r.stderr).toBe(0);
    const rows = r.stdout.split('\n').filter((l) => l.trimStart().startsWith('Na I'));
    expect(rows[0]).toMatch(/588\.995\d\s+-0\.005/);
    expect(rows[1]).toMatch(/589\.592\d\s+\+0\.592/);
  });

  it('exits 1 with a suggestion for an unknown group, 2 for a wavelength that is not a number', () => {
    const group = run(['lookup', '589', '--group', 'flame-test']);
    expect(group.code).toBe(1);
    expect(group.stderr).toContain('did you mean "flame-tests"?');
    const bad = run(['lookup', 'sodium']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('positive number');
  });
});

describe('lineledger import-nist', () => {
  const out = join(mkdtempSync(join(tmpdir(), 'll-nist-')), 'na-i.tsv');

  it('writes a TSV the catalog parser accepts, with the rows of the chosen spectrum', () => {
    const r = run(['import-nist', 'test/fixtures/nist/h-na-lines.csv', '--species', 'Na I', '--out', out]);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain('5 lines of Na I');
    const parsed = parseCatalog({
      version: '0.0.0',
      lineFiles: [{ name: 'na-i.tsv', text: readFileSync(out, 'utf8') }],
      sourceFiles: [{ name: 'sources.yaml', text: readFileSync('data/lines/sources.yaml', 'utf8') }],
      groupsYaml: null,
    });
    expect(parsed.ok && parsed.value.names).toEqual(['Na I']);
  });

  it('exits 1 for a spectrum the export lacks and 2 for a bad --medium', () => {
    const missing = run(['import-nist', 'test/fixtures/nist/h-na-lines.csv', '--species', 'Fe I']);
    expect(missing.code).toBe(1);
    expect(missing.stderr).toMatch(/h-na-lines\.csv:1:1: error\[nist-import\]/);
    const medium = run(['import-nist', 'test/fixtures/nist/h-i-lines.tsv', '--medium', 'water']);
    expect(medium.code).toBe(2);
  });
});
