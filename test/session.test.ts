import { describe, expect, it } from 'vitest';
import { parseAngleDeg } from '../src/session/angles.js';
import { readSessionText } from '../src/session/read.js';

function problems(text: string) {
  const r = readSessionText(text, 'demo.yaml');
  if (r.ok) throw new Error('expected problems');
  return r.diagnostics;
}

describe('reading sessions', () => {
  it('reads a minimal wavelength session with defaults', () => {
    const r = readSessionText('lineledger: 1\nlines:\n  - wavelength: 546.07\n', 'tube-x.yaml');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.value.id).toBe('tube-x');
    expect(r.value.medium).toBe('air');
    expect(r.value.measurement.method).toBe('wavelength');
    expect(r.value.lines[0]?.kind).toBe('emission');
  });

  it('reads source.class and lines_listed, and rejects a class of another kind at its position', () => {
    const r = readSessionText(
      'lineledger: 1\nsource: { kind: nebula, class: planetary-nebula }\nlines_listed: selection\nlines:\n  - wavelength: 500.7\n',
      'pn.yaml',
    );
    if (!r.ok) throw new Error('should read');
    expect(r.value.source.class).toBe('planetary-nebula');
    expect(r.value.lines_listed).toBe('selection');
    const [d] = problems(
      'lineledger: 1\nsource:\n  kind: lamp\n  class: quasar\nlines:\n  - wavelength: 500.7\n',
    );
    expect(d?.code).toBe('invalid-value');
    expect(d?.line).toBe(4);
    expect(d?.message).toContain('kind galaxy');
  });

  it('defaults a line to what its source shows: absorption for stars and daylight, emission for emission-line stars', () => {
    const kindOf = (source: string) => {
      const r = readSessionText(
        `lineledger: 1\nsource: ${source}\nlines:\n  - wavelength: 468.6\n`,
        's.yaml',
      );
      if (!r.ok) throw new Error('should read');
      return r.value.lines[0]?.kind;
    };
    // A photosphere's and scattered sunlight's lines are dark; Wolf–Rayet stars, novae and
    // supernovae show broad emission lines (Gray & Corbally 2009, Stellar Spectral
    // Classification; from memory).
    expect(kindOf('{ kind: star }')).toBe('absorption');
    expect(kindOf('{ kind: star, class: cool-star }')).toBe('absorption');
    expect(kindOf('{ kind: sky, class: daylight }')).toBe('absorption');
    expect(kindOf('{ kind: star, class: wolf-rayet }')).toBe('emission');
    expect(kindOf('{ kind: star, class: nova }')).toBe('emission');
    expect(kindOf('{ kind: sky, class: aurora }')).toBe('emission');
    const told = readSessionText(
      'lineledger: 1\nsource: { kind: star, class: nova }\nlines:\n  - { wavelength: 393.4, kind: absorption }\n',
      's.yaml',
    );
    expect(told.ok && told.value.lines[0]?.kind).toBe('absorption');
  });

  it('maps intensity words to an increasing scale', () => {
    const r = readSessionText(
      'lineledger: 1\nlines:\n  - { wavelength: 500, intensity: very-weak }\n  - { wavelength: 501, intensity: very-strong }\n  - { wavelength: 502, intensity: 7.5 }\n',
      'x.yaml',
    );
    if (!r.ok) throw new Error('should read');
    expect(r.value.lines.map((l) => l.intensity)).toEqual([1, 5, 7.5]);
  });

  it('reports a YAML syntax error with line and column', () => {
    const [d] = problems('lineledger: 1\nlines:\n  - wavelength: [1, 2\n');
    expect(d?.code).toBe('yaml-syntax');
    expect(d?.line).toBeGreaterThanOrEqual(3);
    expect(d?.file).toBe('demo.yaml');
  });

  it('reports a misspelt key at the key, with a suggestion', () => {
    const ds = problems('lineledger: 1\nlines:\n  - wavelength: 500\n    intensty: 3\n');
    expect(ds).toHaveLength(1);
    expect(ds[0]).toMatchObject({ code: 'unknown-key', line: 4, col: 5, field: 'lines[0].intensty' });
    expect(ds[0]?.hint).toContain('intensity');
  });

  it('reports every problem of a file together', () => {
    const ds = problems(
      'lineledger: 1\nsource: { kind: lampp }\nlines:\n  - wavelength: -5\n  - wavelength: abc\n  - { wavelength: 500, kind: emision }\n',
    );
    const fields = ds.map((d) => d.field).sort();
    expect(fields).toEqual(['lines[0].wavelength', 'lines[1].wavelength', 'lines[2].kind', 'source.kind']);
    const neg = ds.find((d) => d.field === 'lines[0].wavelength');
    expect(neg).toMatchObject({ line: 4, col: 17 });
  });

  it('rejects an empty line list and a missing format version', () => {
    const ds = problems('title: nothing\nlines: []\n');
    expect(ds.map((d) => d.code).sort()).toEqual(['empty-list', 'missing-key']);
  });

  it('rejects duplicate keys and alias bombs', () => {
    expect(problems('lineledger: 1\nlineledger: 1\nlines: [{wavelength: 1}]\n')[0]?.code).toBe(
      'duplicate-key',
    );
    const bomb = ['lineledger: 1', 'a: &a [x, x, x, x, x, x, x, x, x]'];
    for (let i = 0; i < 8; i++)
      bomb.push(
        `${String.fromCharCode(98 + i)}: &${String.fromCharCode(98 + i)} [*${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}, *${String.fromCharCode(97 + i)}]`,
      );
    bomb.push('lines: [{wavelength: 1}]');
    expect(problems(bomb.join('\n'))[0]?.code).toBe('yaml-aliases');
  });

  it('reports non-UTF-8 bytes and accepts a byte-order mark and CRLF', () => {
    expect(problems(new Uint8Array([0x6c, 0xff, 0xfe, 0x0a]) as unknown as string).length).toBeGreaterThan(0);
    const bom = readSessionText('\ufefflineledger: 1\r\nlines:\r\n  - wavelength: 500\r\n', 'b.yaml');
    expect(bom.ok).toBe(true);
  });

  it('keeps session ids inside the output folder', () => {
    const ds = problems('lineledger: 1\nid: ../../etc\nlines: [{wavelength: 500}]\n');
    expect(ds[0]?.field).toBe('id');
  });

  it('refuses position keys of another method', () => {
    const ds = problems('lineledger: 1\nlines:\n  - { wavelength: 500, pixel: 12 }\n');
    expect(ds[0]?.code).toBe('mixed-methods');
  });
});

describe('angle readings', () => {
  it('reads degrees and minutes as a spectrometer table is read', () => {
    expect(parseAngleDeg("9° 26'")).toBeCloseTo(9 + 26 / 60, 10);
    expect(parseAngleDeg('9 26')).toBeCloseTo(9 + 26 / 60, 10);
    expect(parseAngleDeg('19d07m30s')).toBeCloseTo(19 + 7 / 60 + 30 / 3600, 10);
    expect(parseAngleDeg('-3:30')).toBeCloseTo(-3.5, 10);
    expect(parseAngleDeg('9.429')).toBeCloseTo(9.429, 10);
    expect(parseAngleDeg('9° 75′')).toBeNull();
    expect(parseAngleDeg('north')).toBeNull();
  });
});
