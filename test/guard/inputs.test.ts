/**
 * Hostile or careless session folders: links to nothing, loops, links leaving the folder,
 * huge files, FIFOs, bad SOURCE_DATE_EPOCH values, thousands of problems. Each gives a
 * positioned problem for that file (or a warning), no stack trace, and the rest still builds.
 */
import { spawnSync } from 'node:child_process';
import {
  closeSync,
  existsSync,
  ftruncateSync,
  openSync,
  readdirSync,
  readFileSync,
  symlinkSync,
  writeFileSync,
} from 'node:fs';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readSourceDateEpoch } from '../../src/build.js';
import { type Diagnostic, escapeControls, formatDiagnosticsWithSource } from '../../src/diagnostics.js';
import { lineledger, project, tree } from './helpers.js';

const noStack = (stderr: string) => expect(stderr).not.toMatch(/internal error|\n\s+at |Error:/);

function siteText(site: string): string {
  const all: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else all.push(readFileSync(p, 'utf8'));
    }
  };
  walk(site);
  return all.join('\n');
}

describe('links in the sessions folder', () => {
  it('a link to nothing and a loop: one positioned problem each, the rest builds', () => {
    const p = project();
    const s = join(p, 'sessions');
    symlinkSync(join(s, 'gone.yaml'), join(s, 'dangling.yaml'));
    symlinkSync(join(s, 'loop-b.yaml'), join(s, 'loop-a.yaml'));
    symlinkSync(join(s, 'loop-a.yaml'), join(s, 'loop-b.yaml'));
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.code).toBe(1);
    expect(vet.stderr).toMatch(/dangling\.yaml:1:1: error\[broken-link\]/);
    expect(vet.stderr).toMatch(/loop-a\.yaml:1:1: error\[link-loop\]/);
    expect(vet.stderr).toContain('4 files checked: 1 clean, 3 with problems');
    noStack(vet.stderr);
    const build = lineledger(['build', 'sessions', '--out', 'site'], p);
    expect(build.code).toBe(1);
    expect(build.stderr).toMatch(/dangling\.yaml:1:1: error\[broken-link\]/);
    expect(build.stderr).toContain('built 1 of 4 sessions');
    noStack(build.stderr);
    expect(existsSync(join(p, 'site', 'sessions', 'tube-b-2026-03-14', 'index.html'))).toBe(true);
  });

  it('a link leaving the sessions folder is not followed, and says so', () => {
    const p = project();
    const secret = join(dirname(p), 'secret.yaml');
    writeFileSync(
      secret,
      readFileSync(join(p, 'sessions', '2026-03-14-tube-b.yaml'), 'utf8')
        .replace(/^id: .*$/m, 'id: secret-session')
        .replace(/^title: .*$/m, 'title: SECRET-TITLE-7731'),
    );
    symlinkSync(secret, join(p, 'sessions', 'outside.yaml'));
    const build = lineledger(['build', 'sessions', '--out', 'site'], p);
    expect(build.code).toBe(1);
    expect(build.stderr).toMatch(/outside\.yaml:1:1: error\[link-outside\] .*outside the sessions folder/);
    expect(siteText(join(p, 'site'))).not.toContain('SECRET-TITLE-7731');
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.stderr).toMatch(/outside\.yaml:1:1: error\[link-outside\]/);
    // Named on the command line, the file is the user's explicit choice: it is checked.
    expect(lineledger(['vet', 'sessions/outside.yaml'], p).stderr).not.toContain('link-outside');
  });
});

describe('files that are not session-sized text', () => {
  it('a 3 GiB file is refused by its size before it is read; the rest builds', () => {
    const p = project();
    // Sparse: takes no space, but reading it would need 3 GiB of memory.
    const fd = openSync(join(p, 'sessions', 'huge.yaml'), 'w');
    ftruncateSync(fd, 3 * 1024 ** 3);
    closeSync(fd);
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.code).toBe(1);
    expect(vet.stderr).toMatch(
      /huge\.yaml:1:1: error\[file-too-large\] the file is 3221225472 bytes; the limit is 2097152/,
    );
    noStack(vet.stderr);
    const build = lineledger(['build', 'sessions', '--out', 'site'], p);
    expect(build.code).toBe(1);
    expect(build.stderr).toContain('built 1 of 2 sessions');
    noStack(build.stderr);
  });

  it('a FIFO named like a session is reported, not opened (which would hang)', () => {
    const p = project();
    const made = spawnSync('mkfifo', [join(p, 'sessions', 'pipe.yaml')]);
    if (made.status !== 0) return; // no mkfifo on this system
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.stderr).toMatch(/pipe\.yaml:1:1: error\[not-a-file\]/);
  });
});

describe('SOURCE_DATE_EPOCH', () => {
  it('reads digits up to the year 9999; anything else is a warning and ignored', () => {
    // 1767225600 s = 2026-01-01T00:00:00Z (date -u -d @1767225600).
    expect(readSourceDateEpoch('1767225600')).toEqual({ builtOn: '2026-01-01', problem: null });
    expect(readSourceDateEpoch(undefined)).toEqual({ builtOn: null, problem: null });
    for (const bad of ['8640000000001', 'abc', '-1', '1e10', '253402300800', ' 5'])
      expect(readSourceDateEpoch(bad)).toMatchObject({
        builtOn: null,
        problem: expect.stringContaining('ignored'),
      });
  });

  it('a bad value warns and the build still succeeds', () => {
    const p = project();
    for (const bad of ['8640000000001', 'abc', '-1', '1e10']) {
      const r = lineledger(['build', 'sessions', '--out', 'site'], p, { SOURCE_DATE_EPOCH: bad });
      expect(r.code, r.stderr).toBe(0);
      expect(r.stderr).toContain(`warning: SOURCE_DATE_EPOCH="${bad}"`);
      noStack(r.stderr);
    }
  });
});

describe('many problems', () => {
  it('vet prints 100 of 4000 and counts the rest', () => {
    const p = project();
    const lines = Array.from({ length: 4000 }, () => '  - { wavelength: 500, sigmaa: 1 }');
    writeFileSync(join(p, 'sessions', 'many.yaml'), `lineledger: 1\nlines:\n${lines.join('\n')}\n`);
    const r = lineledger(['vet', 'sessions/many.yaml'], p);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('… and 3,900 more problems');
    expect(r.stderr.split('\n').length).toBeLessThan(400);
    // All of them in JSON, whole through a pipe (the process used to exit before it drained).
    const json = lineledger(['vet', 'sessions/many.yaml', '--format', 'json'], p);
    expect(JSON.parse(json.stdout).summary.errors).toBe(4000);
  });

  it('formats each problem once, with the source split once', () => {
    const d = (line: number): Diagnostic => ({
      file: 'f.yaml',
      line,
      col: 3,
      severity: 'error',
      code: 'x',
      field: '',
      message: 'm',
    });
    const out = formatDiagnosticsWithSource([d(1), d(2), d(3)], 'ab\ncd\nef', 2);
    expect(out).toHaveLength(3);
    expect(out[1]).toContain(' 2 | cd');
    expect(out[2]).toBe('f.yaml: … and 1 more problem (lineledger vet --format json f.yaml lists them all)');
  });
});

describe('control characters never reach the terminal raw', () => {
  it('escapes C0, DEL, C1 and bidi overrides, keeps tabs and text', () => {
    expect(escapeControls('a\x1b]0;pwned\x07b')).toBe('a\\x1b]0;pwned\\x07b');
    expect(escapeControls('\x1b[2J\x00\x7f\x9b')).toBe('\\x1b[2J\\x00\\x7f\\x9b');
    expect(escapeControls('x\u202ey\n\tz é 日本')).toBe('x\\u202ey\\n\tz é 日本');
  });
});

it('the whole tree is untouched by vet', () => {
  const p = project();
  symlinkSync(join(p, 'nothing'), join(p, 'sessions', 'dangling.yaml'));
  const before = tree(dirname(p));
  lineledger(['vet', 'sessions'], p);
  expect(tree(dirname(p))).toEqual(before);
});
