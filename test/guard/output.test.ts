/**
 * `build --out`, `--cache-dir`, `import-nist --out` and `new` never replace what lineledger did
 * not write. Each refused case compares the whole temporary tree (listing and contents)
 * before and after the command: nothing may be deleted or changed.
 */
import { existsSync, mkdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { decideTarget, relation, type TargetFacts } from '../../src/write/guard.js';
import { expectRefused, lineledger, project, tree } from './helpers.js';

/** Runs a command that must be refused; the whole temporary tree around project p is untouched. */
function refused(p: string, cwd: string, args: string[], reason: RegExp): void {
  const before = tree(dirname(p));
  expectRefused(lineledger(args, cwd), reason);
  expect(tree(dirname(p))).toEqual(before);
}

describe('build --out: refused', () => {
  it('the sessions folder itself', () => {
    const p = project();
    refused(p, p, ['build', 'sessions', '--out', 'sessions'], /is the sessions folder/);
  });

  it('the current folder (--out .), which holds the sessions', () => {
    const p = project();
    refused(p, p, ['build', 'sessions', '--out', '.'], /contains the sessions folder/);
  });

  it('--out .. from inside the sessions folder', () => {
    const p = project();
    refused(p, join(p, 'sessions'), ['build', '.', '--out', '..'], /contains the sessions folder/);
  });

  it('the project folder by its absolute path', () => {
    const p = project();
    refused(p, p, ['build', 'sessions', '--out', p], /contains the sessions folder/);
  });

  it('an ancestor of the current folder', () => {
    const p = project();
    refused(p, join(p, 'sessions'), ['build', '.', '--out', dirname(p)], /contains the sessions folder/);
  });

  it('out: . in lineledger.yaml', () => {
    const p = project();
    writeFileSync(join(p, 'lineledger.yaml'), 'lineledger-project: 1\nsessions: sessions\nout: .\n');
    refused(p, p, ['build'], /contains the sessions folder/);
  });

  it("the config file's folder when the sessions are elsewhere", () => {
    const p = project();
    mkdirSync(join(p, 'conf'));
    writeFileSync(
      join(p, 'conf', 'lineledger.yaml'),
      'lineledger-project: 1\nsessions: ../sessions\nout: .\n',
    );
    writeFileSync(join(p, 'conf', 'mine.txt'), 'mine\n');
    refused(
      p,
      join(p, 'sessions'),
      ['build', '--config', '../conf/lineledger.yaml'],
      /is the config file's folder/,
    );
  });

  it('a file (--out notes.txt)', () => {
    const p = project();
    refused(p, p, ['build', 'sessions', '--out', 'notes.txt'], /is a file/);
  });

  it('the root of a git work tree', () => {
    const p = project();
    const repo = join(p, 'repo');
    mkdirSync(join(repo, '.git'), { recursive: true });
    writeFileSync(join(repo, '.git', 'HEAD'), 'ref: refs/heads/main\n');
    writeFileSync(join(repo, 'README'), 'mine\n');
    // Run from elsewhere, so only the git root (not the current folder) protects it.
    refused(p, join(p, 'sessions'), ['build', '.', '--out', repo], /git work tree/);
    // Run from inside it too.
    refused(p, repo, ['build', '../sessions', '--out', '.'], /is the current folder|git work tree/);
  });

  it('a folder inside the sessions folder', () => {
    const p = project();
    refused(p, p, ['build', 'sessions', '--out', 'sessions/site'], /lies inside the sessions folder/);
  });

  it('a folder of the user’s (not empty, not a site)', () => {
    const p = project();
    mkdirSync(join(p, 'docs'));
    writeFileSync(join(p, 'docs', 'paper.tex'), '\\documentclass{article}\n');
    refused(p, p, ['build', 'sessions', '--out', 'docs'], /not a site lineledger wrote/);
  });

  it('a previous site the user has put a file of their own into', () => {
    const p = project();
    expect(lineledger(['build', 'sessions', '--out', 'site'], p).code).toBe(0);
    writeFileSync(join(p, 'site', 'my-notes.txt'), 'mine\n');
    refused(p, p, ['build', 'sessions', '--out', 'site'], /not a site lineledger wrote/);
  });

  it('a symbolic link (the build would replace the link)', () => {
    const p = project();
    mkdirSync(join(p, 'real'));
    symlinkSync(join(p, 'real'), join(p, 'linked'));
    refused(p, p, ['build', 'sessions', '--out', 'linked'], /symbolic link/);
  });
});

describe('build --out: allowed', () => {
  it('an absent folder, an empty one, and its own earlier site (with or without a cache)', () => {
    const p = project();
    expect(lineledger(['build', 'sessions', '--out', 'site'], p).code).toBe(0);
    expect(existsSync(join(p, 'site', 'index.html'))).toBe(true);
    // Rebuilt over itself, recognised from the manifest.
    expect(lineledger(['build', 'sessions', '--out', 'site', '--title', 'Two'], p).code).toBe(0);
    expect(readFileSync(join(p, 'site', 'index.html'), 'utf8')).toContain('Two');
    // No cache (so no manifest): recognised from its generator mark and its files.
    const r = lineledger(['build', 'sessions', '--out', 'site', '--no-cache', '--title', 'Three'], p);
    expect(r.code, r.stderr).toBe(0);
    expect(readFileSync(join(p, 'site', 'index.html'), 'utf8')).toContain('Three');
    mkdirSync(join(p, 'empty'));
    expect(lineledger(['build', 'sessions', '--out', 'empty', '--no-cache'], p).code).toBe(0);
    expect(existsSync(join(p, 'notes.txt'))).toBe(true);
  });
});

describe('build --cache-dir: refused', () => {
  it('the sessions folder, a folder of the user’s, the current folder, the inside of the site', () => {
    const p = project();
    refused(
      p,
      p,
      ['build', 'sessions', '--out', 'site', '--cache-dir', 'sessions'],
      /is the sessions folder/,
    );
    mkdirSync(join(p, 'stuff'));
    writeFileSync(join(p, 'stuff', 'a.txt'), 'a\n');
    refused(p, p, ['build', 'sessions', '--out', 'site', '--cache-dir', 'stuff'], /not a lineledger cache/);
    refused(
      p,
      join(p, 'stuff'),
      ['build', '../sessions', '--out', '../site', '--cache-dir', '.'],
      /is the current folder/,
    );
    refused(
      p,
      p,
      ['build', 'sessions', '--out', 'site', '--cache-dir', 'site/cache'],
      /lies inside the output folder/,
    );
    refused(p, p, ['build', 'sessions', '--out', 'site', '--cache-dir', 'notes.txt'], /is a file/);
  });

  it('accepts its own cache again', () => {
    const p = project();
    expect(lineledger(['build', 'sessions', '--out', 'site', '--cache-dir', 'c'], p).code).toBe(0);
    // A second session rebuilds the site (no up-to-date skip); the first comes from the cache.
    const first = join(p, 'sessions', '2026-03-14-tube-b.yaml');
    writeFileSync(
      join(p, 'sessions', '2026-03-15-tube-b.yaml'),
      readFileSync(first, 'utf8').replace(/^id: .*$/m, 'id: tube-b-copy'),
    );
    const again = lineledger(['build', 'sessions', '--out', 'site', '--cache-dir', 'c', '--verbose'], p);
    expect(again.code, again.stderr).toBe(0);
    expect(again.stderr).toContain('1 from the cache, 1 computed');
  });
});

describe('import-nist --out', () => {
  const fixture = join(process.cwd(), 'test', 'fixtures', 'nist', 'h-na-lines.csv');

  it('never overwrites its own input, even with --force', () => {
    const p = project();
    writeFileSync(join(p, 'export.csv'), readFileSync(fixture));
    refused(
      p,
      p,
      ['import-nist', 'export.csv', '--species', 'Na I', '--out', 'export.csv'],
      /is the input file/,
    );
    refused(
      p,
      p,
      ['import-nist', 'export.csv', '--species', 'Na I', '--out', './export.csv', '--force'],
      /is the input file/,
    );
    symlinkSync(join(p, 'export.csv'), join(p, 'alias.csv'));
    refused(
      p,
      p,
      ['import-nist', 'alias.csv', '--species', 'Na I', '--out', 'export.csv', '--force'],
      /is the input file/,
    );
  });

  it('refuses an existing file without --force, and a folder always', () => {
    const p = project();
    refused(
      p,
      p,
      ['import-nist', fixture, '--species', 'Na I', '--out', 'notes.txt'],
      /already exists.*--force/,
    );
    refused(
      p,
      p,
      ['import-nist', fixture, '--species', 'Na I', '--out', 'sessions', '--force'],
      /is a folder/,
    );
    const forced = lineledger(
      ['import-nist', fixture, '--species', 'Na I', '--out', 'notes.txt', '--force'],
      p,
    );
    expect(forced.code, forced.stderr).toBe(0);
    expect(readFileSync(join(p, 'notes.txt'), 'utf8')).toContain('Na I');
  });
});

describe('new', () => {
  it('refuses an existing session without --force, and with --force a folder or a link', () => {
    const p = project();
    const file = join('sessions', '2026-03-14-tube-b.yaml');
    const before = tree(dirname(p));
    const r = lineledger(['new', file, '--method', 'wavelength'], p);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/already exists.*--force/);
    expect(tree(dirname(p))).toEqual(before);
    mkdirSync(join(p, 'folder.yaml'));
    refused(p, p, ['new', 'folder.yaml', '--method', 'wavelength', '--force'], /is a folder/);
    symlinkSync(join(p, 'notes.txt'), join(p, 'link.yaml'));
    refused(p, p, ['new', 'link.yaml', '--method', 'wavelength', '--force'], /symbolic link/);
  });
});

describe('the decision (pure)', () => {
  const facts = (over: Partial<TargetFacts>): TargetFacts => ({
    path: '/a/site',
    shown: 'site',
    kind: 'folder',
    empty: false,
    recognised: true,
    gitRoot: false,
    ...over,
  });
  const places = [
    { path: '/a/sessions', what: 'the sessions folder', inside: true },
    { path: '/a', what: 'the current folder', inside: false },
  ];

  it('relates paths by whole segments', () => {
    expect(relation('/a/site', '/a/site')).toBe('same');
    expect(relation('/a', '/a/site')).toBe('contains');
    expect(relation('/a/site/x', '/a/site')).toBe('inside');
    expect(relation('/a/site2', '/a/site')).toBe(null);
    expect(relation('/a/..site', '/a/site')).toBe(null);
    expect(relation('/A/Site', '/a/site', true)).toBe('same');
  });

  it('allows absent, empty and recognised folders beside the sessions', () => {
    expect(decideTarget('output', facts({ kind: 'absent' }), places)).toBe(null);
    expect(decideTarget('output', facts({ empty: true, recognised: false }), places)).toBe(null);
    expect(decideTarget('output', facts({}), places)).toBe(null);
  });

  it('refuses by place before contents: a recognised site that is the current folder', () => {
    expect(decideTarget('output', facts({ path: '/a' }), places)?.reason).toMatch(/contains the sessions/);
    expect(decideTarget('output', facts({ path: '/a/sessions/s' }), places)?.reason).toMatch(/lies inside/);
    expect(decideTarget('output', facts({ gitRoot: true }), places)?.reason).toMatch(/git/);
    expect(decideTarget('output', facts({ recognised: false }), places)?.reason).toMatch(/not a site/);
    expect(decideTarget('output', facts({ kind: 'file' }), places)?.reason).toMatch(/file/);
  });
});
