/** `lineledger new`: the pure templates, the schema reference and the command line. */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, isAbsolute, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { reduceSession } from '../src/reduce/reduce.js';
import { readSessionText } from '../src/session/read.js';
import { dateFromFileName, schemaReference, sessionTemplate } from '../src/session/scaffold.js';
import { METHODS } from '../src/session/schema.js';
import type { MeasurementMethod } from '../src/session/types.js';

const CLI = join(process.cwd(), 'dist', 'cli.js');
const template = (method: MeasurementMethod) =>
  sessionTemplate({
    method,
    date: '2031-07-09',
    id: 'bench-run',
    schemaRef: '../schema/session-1.schema.json',
  });

/** What a user would write in place of each `~`, by key, in order of appearance. */
const FILLS: Record<string, (string | number)[]> = {
  title: ['"Bench run"'],
  observer: ['Test bench'],
  kind: ['lamp'],
  description: ['bench spectrometer'],
  sigma: [0.5],
  lines_per_mm: [600],
  screen_distance_mm: [1000],
  wavelength: [404.656, 435.833, 546.074],
  pixel: [100, 200, 550, 150, 300, 420],
  angle_left_deg: ['"135° 43\'"', '"137° 41\'"', '"140° 48\'"'],
  angle_right_deg: ['"104° 37\'"', '"102° 39\'"', '"99° 32\'"'],
  offset_mm: [131.3, 166.3, 175.8],
};

function fill(text: string): string {
  const used = new Map<string, number>();
  return text.replace(/([a-z_]+): ~/g, (_all, key: string) => {
    const n = used.get(key) ?? 0;
    used.set(key, n + 1);
    const values = FILLS[key];
    if (!values || values[n] === undefined) throw new Error(`no fill for ${key} #${n}`);
    return `${key}: ${values[n]}`;
  });
}

describe('session templates', () => {
  for (const method of METHODS) {
    it(`${method}: once filled in, reads without diagnostics and reduces`, () => {
      const r = readSessionText(fill(template(method)), 'bench-run.yaml');
      if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
      expect(r.warnings).toEqual([]);
      expect(r.value.measurement.method).toBe(method);
      expect(r.value).toMatchObject({ id: 'bench-run', date: '2031-07-09', title: 'Bench run' });
      expect(r.value.lines).toHaveLength(3);
      const reduced = reduceSession(r.value);
      expect(reduced.ok, JSON.stringify(reduced)).toBe(true);
    });

    it(`${method}: unfilled, it is refused with one "has no value" per empty field, at the ~`, () => {
      const text = template(method);
      const r = readSessionText(text, 'bench-run.yaml');
      expect(r.ok).toBe(false);
      if (r.ok) return;
      const empties = text
        .split('\n')
        .flatMap((l, i) => [...l.matchAll(/: ~/g)].map((m) => `${i + 1}:${m.index + 3}`));
      expect(r.diagnostics.map((d) => d.code)).toEqual(empties.map(() => 'empty-value'));
      expect(r.diagnostics.map((d) => `${d.line}:${d.col}`).sort()).toEqual(empties.sort());
      for (const d of r.diagnostics) expect(d.message).toBe('has no value');
    });
  }

  it('starts with the schema comment and marks every placeholder', () => {
    const text = template('screen');
    expect(text.split('\n')[0]).toBe('# yaml-language-server: $schema=../schema/session-1.schema.json');
    for (const line of text.split('\n').filter((l) => l.includes('FILL IN'))) expect(line).toContain('~');
  });
});

describe('schemaReference', () => {
  it('is the path from the new file to the schema, inside the project or not', () => {
    const root = resolve('/opt/pkg');
    const schema = join(root, 'schema', 'session-1.schema.json');
    expect(schemaReference(join(root, 'data', 'sessions'), root, schema)).toEqual({
      ref: '../../schema/session-1.schema.json',
      inside: true,
    });
    expect(schemaReference(root, root, schema)).toEqual({
      ref: 'schema/session-1.schema.json',
      inside: true,
    });
    // An archive of its own with lineledger elsewhere: still relative, but said to lead out.
    const club = resolve('/home/club');
    expect(schemaReference(join(club, 'sessions'), club, schema)).toEqual({
      ref: '../../../opt/pkg/schema/session-1.schema.json',
      inside: false,
    });
  });
});

describe('dateFromFileName', () => {
  it.each([
    ['sessions/2026-06-01-tube.yaml', '2026-06-01'],
    ['2026-06-01.yaml', '2026-06-01'],
    ['C:\\club\\2024-02-29 lamp.yml', '2024-02-29'],
    // No such day (Gregorian calendar: 2026 is no leap year).
    ['2026-02-29-tube.yaml', null],
    ['20260601-tube.yaml', null],
    ['2026-06-012.yaml', null],
    ['tube-2026-06-01.yaml', null],
  ])('%s → %s', (name, want) => {
    expect(dateFromFileName(name)).toBe(want);
  });
});

describe('lineledger new (command line)', () => {
  const run = (args: string[]) => spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });

  it('writes a template with today’s date and an id from the file name, and refuses to overwrite', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'll-new-')), 'Tube C (2nd try).yaml');
    const before = new Date();
    const made = run(['new', file, '--method', 'grating-angle']);
    expect(made.status, made.stderr).toBe(0);
    const text = readFileSync(file, 'utf8');
    expect(text).toContain('id: tube-c-2nd-try ');
    expect(text).toContain('  method: grating-angle');
    const date = /^date: (\S+)/m.exec(text)?.[1];
    const local = (d: Date) =>
      `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, '0')}-${String(d.getDate()).padStart(2, '0')}`;
    expect([local(before), local(new Date())]).toContain(date);
    // Outside this repository the schema is still named relative to the new file (an absolute
    // path names one machine), and the output says that it leads out of the project.
    const ref = /\$schema=(.+)$/m.exec(text)?.[1] ?? '';
    expect(isAbsolute(ref)).toBe(false);
    expect(existsSync(join(dirname(file), ref))).toBe(true);
    expect(made.stderr).toContain('the $schema path on the first line leads out of this project');
    // The id is not the file name: said, not silent.
    expect(made.stderr).toContain('the id is tube-c-2nd-try, not "Tube C (2nd try)"');

    writeFileSync(file, 'mine');
    const again = run(['new', file, '--method', 'pixel']);
    expect(again.status).toBe(1);
    expect(again.stderr).toContain('--force');
    expect(readFileSync(file, 'utf8')).toBe('mine');
    expect(run(['new', file, '--method', 'pixel', '--force']).status).toBe(0);
    expect(readFileSync(file, 'utf8')).toContain('  method: pixel');
  });

  it('takes the date from a file name that starts with one, and is silent about an id equal to the name', () => {
    const file = join(mkdtempSync(join(tmpdir(), 'll-new-')), '2026-06-01-tube.yaml');
    const made = run(['new', file, '--method', 'wavelength']);
    expect(made.status, made.stderr).toBe(0);
    const text = readFileSync(file, 'utf8');
    expect(/^date: (\S+)/m.exec(text)?.[1]).toBe('2026-06-01');
    expect(/^id: (\S+)/m.exec(text)?.[1]).toBe('2026-06-01-tube');
    expect(made.stderr).toContain('date 2026-06-01 from the file name');
    expect(made.stderr).not.toContain('the id is');
  });

  it('says so when a file name becomes a different id', () => {
    const dir = mkdtempSync(join(tmpdir(), 'll-new-'));
    const made = run(['new', join(dir, 'Bad_Name.yaml'), '--method', 'pixel']);
    expect(made.status, made.stderr).toBe(0);
    expect(/^id: (\S+)/m.exec(readFileSync(join(dir, 'Bad_Name.yaml'), 'utf8'))?.[1]).toBe('bad-name');
    expect(made.stderr).toContain('the id is bad-name, not "Bad_Name"');
  });

  it('points at the schema by a relative path inside this repository', () => {
    const file = join('test-artifacts', `new-${process.pid}`, 'x.yaml');
    const made = run(['new', file, '--method', 'wavelength']);
    expect(made.status).toBe(0);
    const ref = /\$schema=(.+)$/m.exec(readFileSync(file, 'utf8'))?.[1] ?? '';
    expect(ref).toBe('../../schema/session-1.schema.json');
    expect(existsSync(join(dirname(file), ref))).toBe(true);
    expect(made.stderr).not.toContain('leads out of this project');
  });

  it('exits 2 for a bad method or a name the build would not read', () => {
    const dir = mkdtempSync(join(tmpdir(), 'll-new-'));
    expect(run(['new', join(dir, 'a.yaml'), '--method', 'prism']).status).toBe(2);
    expect(run(['new', join(dir, 'a.yaml')]).status).toBe(2);
    expect(run(['new', join(dir, 'a.txt'), '--method', 'pixel']).status).toBe(2);
  });
});
