/** Messages a newcomer meets: a wrong spelling of a closed word gets a did-you-mean. */
import { describe, expect, it } from 'vitest';
import { readSessionText } from '../src/session/read.js';

function problems(yaml: string) {
  const r = readSessionText(yaml, 's.yaml');
  return r.ok ? [] : r.diagnostics;
}

describe('did-you-mean for closed words', () => {
  it.each([
    ['Å', 'angstrom'],
    ['A', 'angstrom'],
    ['Angstrom', 'angstrom'],
  ])('unit: %s suggests %s', (unit, want) => {
    const d = problems(`lineledger: 1\nmeasurement: { unit: ${unit} }\nlines:\n  - { wavelength: 4047 }\n`);
    expect(d.map((x) => x.hint)).toContain(`did you mean "${want}"?`);
  });
  it('medium: Air suggests air', () => {
    const d = problems('lineledger: 1\nmedium: Air\nlines:\n  - { wavelength: 404.7 }\n');
    expect(d.map((x) => x.hint)).toContain('did you mean "air"?');
    expect(d[0]?.line).toBe(2);
  });
});

describe('a value that holds a comma', () => {
  it('says to quote it instead of calling its tail an unknown key', () => {
    const d = problems(
      'lineledger: 1\nsource: { kind: sky, name: blue sky, not the Sun }\nlines:\n  - { wavelength: 486.1 }\n',
    );
    const unknown = d.find((x) => x.code === 'unknown-key');
    expect(unknown?.hint).toContain('must be quoted');
    expect(unknown?.line).toBe(2);
  });
});

describe('an unknown key hides no other problem of the file', () => {
  // The README promises every problem of a file at once; a misspelt key must not stop the
  // checks that come after the schema (dates, readings, keys each method needs).
  const yaml = [
    'lineledger: 1', // 1
    'date: 2026-02-30', // 2: no such day (Gregorian calendar: February 2026 has 28 days)
    'colour: blue', // 3: unknown key
    'source: { kind: lamp }', // 4
    'measurement: { sigma: 0.3 }', // 5
    'lines:', // 6
    '  - { wavelength: 546.1, colr: green }', // 7: unknown key in a line
    '  - wavelength: abc', // 8: not a number
    '  - intensity: 3', // 9: no wavelength
    '  - wavelength: 2000000', // 10: 2 mm is no optical wavelength
    '',
  ].join('\n');
  const d = problems(yaml);
  const at = (code: string) => d.filter((x) => x.code === code).map((x) => `${x.field}@${x.line}:${x.col}`);

  it('reports the unknown keys, each at its own place', () => {
    expect(at('unknown-key')).toEqual(['colour@3:1', 'lines[0].colr@7:26']);
  });
  it('reports the type error beside them', () => {
    expect(at('invalid-value')).toEqual(['lines[1].wavelength@8:17']);
  });
  it('reports the problems found after the schema: date, missing reading, impossible reading', () => {
    expect(at('invalid-date')).toEqual(['date@2:7']);
    expect(at('missing-key')).toEqual(['lines[2]@9:5']);
    expect(at('impossible-value')).toEqual(['lines[3].wavelength@10:17']);
  });
  it('does not repeat a bad value as a missing one', () => {
    expect(d.filter((x) => x.field.startsWith('lines[1]'))).toHaveLength(1);
  });
  it('lists them in file order', () => {
    const lines = d.map((x) => x.line);
    expect(lines).toEqual([...lines].sort((a, b) => a - b));
  });
  it('does not judge the readings against a default when the method itself is misspelt', () => {
    // With method taken out the lines would be judged as wavelength readings: every angle
    // would be called a mixed method. Only the method's own problem is reported.
    const m = problems(
      'lineledger: 1\nmeasurement: { method: grating-angel, grating: { lines_per_mm: 600 } }\nlines:\n  - angle_deg: 19.1\n',
    );
    expect(m.map((x) => x.code)).toEqual(['invalid-value']);
    expect(m[0]).toMatchObject({ field: 'measurement.method', line: 2 });
  });
});
