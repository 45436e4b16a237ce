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
