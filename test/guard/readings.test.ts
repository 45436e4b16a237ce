/**
 * Readings no instrument gives, dates that do not exist, keys that contradict each other,
 * control characters in text, and default ids from odd file names: each an error (or a
 * warning for the id) at the position of the field.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Diagnostic } from '../../src/diagnostics.js';
import { impossibleDate } from '../../src/session/plausible.js';
import { readSessionText } from '../../src/session/read.js';
import { lineledger, project } from './helpers.js';

function problems(text: string, file = 's.yaml'): Diagnostic[] {
  const r = readSessionText(text, file);
  return r.ok ? r.warnings : r.diagnostics;
}

const wl = (value: string, extra = '') => `lineledger: 1\n${extra}lines:\n  - wavelength: ${value}\n`;

describe('impossible readings', () => {
  it.each([
    ['1e308', 'above'],
    ['1.2e29', 'above'],
    ['1e-320', 'below'],
    ['0.5', 'below'],
  ])('wavelength %s nm is an error at its position (%s the bounds)', (value, side) => {
    const d = problems(wl(value));
    expect(d).toContainEqual(
      expect.objectContaining({ code: 'impossible-value', line: 3, col: 17, field: 'lines[0].wavelength' }),
    );
    expect(d.find((x) => x.code === 'impossible-value')?.message).toContain(side);
  });

  it('bounds apply after the unit: 5000 angstrom is fine, 5e7 um is not', () => {
    expect(readSessionText(wl('5000', 'measurement: { unit: angstrom }\n'), 's.yaml').ok).toBe(true);
    expect(problems(wl('5e7', 'measurement: { unit: um }\n')).map((d) => d.code)).toContain(
      'impossible-value',
    );
  });

  it('.inf is not a reading', () => {
    expect(problems(wl('.inf')).map((d) => d.code)).toContain('invalid-value');
  });

  it('redshift 1e300 and a velocity past the speed of light are errors at shift', () => {
    const z = problems(wl('500', 'shift: { redshift: 1e300 }\n'));
    expect(z).toContainEqual(
      expect.objectContaining({ code: 'impossible-value', field: 'shift.redshift', line: 2 }),
    );
    const v = problems(wl('500', 'shift: { velocity_km_s: 300000 }\n'));
    // The schema already bounds a velocity; either way it is an error at the field.
    expect(v).toContainEqual(
      expect.objectContaining({ severity: 'error', field: 'shift.velocity_km_s', line: 2 }),
    );
    // A real quasar redshift (z = 0.158 for 3C 273, Schmidt 1963) passes.
    expect(readSessionText(wl('500', 'shift: { redshift: 0.158 }\n'), 's.yaml').ok).toBe(true);
  });

  it('angle_deg with angle_left/right, and offset_mm with separation_mm, are conflicting keys', () => {
    const grating = 'measurement: { method: grating-angle, grating: { lines_per_mm: 600 } }\n';
    const a = problems(
      `lineledger: 1\n${grating}lines:\n  - { angle_deg: 5, angle_left_deg: 10, angle_right_deg: 30 }\n`,
    );
    expect(a).toContainEqual(
      expect.objectContaining({ code: 'conflicting-keys', field: 'lines[0].angle_deg', line: 4 }),
    );
    const screen =
      'measurement: { method: screen, grating: { lines_per_mm: 600 }, screen_distance_mm: 500 }\n';
    const s = problems(`lineledger: 1\n${screen}lines:\n  - { offset_mm: 150, separation_mm: 300 }\n`);
    expect(s).toContainEqual(
      expect.objectContaining({ code: 'conflicting-keys', field: 'lines[0].offset_mm' }),
    );
  });
});

describe('dates', () => {
  it('2026-02-30 does not exist; leap days follow the Gregorian rule', () => {
    expect(problems(wl('500', 'date: 2026-02-30\n'))).toContainEqual(
      expect.objectContaining({ code: 'invalid-date', field: 'date', line: 2, col: 7 }),
    );
    // Gregorian calendar: 2024 and 2000 are leap years, 1900 and 2026 are not.
    expect(impossibleDate('2024-02-29')).toBe(null);
    expect(impossibleDate('2000-02-29')).toBe(null);
    expect(impossibleDate('1900-02-29')).toMatch(/28 days/);
    expect(impossibleDate('2026-13-01')).toMatch(/no month/);
    expect(impossibleDate('2026-04-31')).toMatch(/30 days/);
    expect(impossibleDate('2026-03-14T24:00:00Z')).toMatch(/time of day/);
    expect(impossibleDate('2026-03-14T21:30:00+15:00')).toMatch(/offset/);
    expect(impossibleDate('2026-03-14T21:30:00Z')).toBe(null);
  });
});

describe('control characters in text', () => {
  it.each([
    ['title', 'title: "a\\e]0;pwned\\ab"\n', 'title', 2],
    ['a NUL in the title', 'title: "x\\0y"\n', 'title', 2],
    ['the observer', 'observer: "\\e[2J"\n', 'observer', 2],
    ['notes', 'notes: "ok\\u202Eevil"\n', 'notes', 2],
  ])('%s is an error at its position', (_what, extra, field, line) => {
    expect(problems(wl('500', extra))).toContainEqual(
      expect.objectContaining({ code: 'control-character', field, line }),
    );
  });

  it('tabs and line breaks in notes are fine', () => {
    expect(readSessionText(wl('500', 'notes: "a\\tb\\nc"\n'), 's.yaml').ok).toBe(true);
  });

  it('vet reports them and never echoes them raw; build does not publish them', () => {
    const p = project();
    writeFileSync(join(p, 'sessions', 'esc.yaml'), wl('500', 'title: "\\e]0;pwned\\a\\e[2J"\n'));
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.code).toBe(1);
    expect(vet.stderr).toMatch(/esc\.yaml:2:8: error\[control-character\] title/);
    expect(vet.stderr).not.toContain('\u001b');
    expect(vet.stderr).not.toContain('\u0007');
    const build = lineledger(['build', 'sessions', '--out', 'site'], p);
    expect(build.code).toBe(1);
    expect(build.stderr).not.toContain('\u001b');
  });

  it('a file name with an escape sequence is refused, and shown escaped', () => {
    const p = project();
    writeFileSync(join(p, 'sessions', '\x1b[2Jx.yaml'), wl('500'));
    const vet = lineledger(['vet', 'sessions'], p);
    expect(vet.stderr).toContain('\\x1b[2Jx.yaml:1:1: error[control-character]');
    expect(vet.stderr).not.toContain('\u001b');
  });
});

describe('default ids from odd file names', () => {
  it('stay distinct and say what was chosen', () => {
    const ids = new Map<string, string>();
    for (const name of ['日本語.yaml', '🙂.yaml', '..yaml', 'a\\b.yaml', 'b.yaml']) {
      const r = readSessionText(wl('500'), `/x/${name}`);
      expect(r.ok, name).toBe(true);
      if (!r.ok) continue;
      ids.set(name, r.value.id);
      if (/^session-/.test(r.value.id))
        expect(r.warnings).toContainEqual(expect.objectContaining({ code: 'default-id', field: 'id' }));
    }
    expect(new Set(ids.values()).size).toBe(5);
    if (process.platform !== 'win32') expect(ids.get('a\\b.yaml')).toBe('a-b');
  });

  it('build gives each its own page', () => {
    const p = project();
    mkdirSync(join(p, 'odd'));
    for (const name of ['日本語.yaml', '🙂.yaml', '..yaml']) writeFileSync(join(p, 'odd', name), wl('589.0'));
    const r = lineledger(['build', 'odd', '--out', 'site'], p);
    expect(r.stderr).not.toContain('duplicate-id');
    expect(r.stderr).toContain('built 3 of 3');
  });
});
