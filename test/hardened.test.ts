/** Hostile and broken input: every limit and encoding problem is refused with a clear, placed diagnostic. */
import { describe, expect, it } from 'vitest';
import { SESSION_LIMITS } from '../src/session/limits.js';
import { readSessionText, safeIdFromFileName } from '../src/session/read.js';
import { SessionSchema } from '../src/session/schema.js';

const TAIL = 'lines: [{wavelength: 500}]\n';

function problems(text: string | Uint8Array, options = {}) {
  const r = readSessionText(text, 'h.yaml', options);
  if (r.ok) throw new Error('expected problems');
  return r.diagnostics;
}

describe('size and structure limits', () => {
  it('refuses a file over the byte limit, saying the size and the limit', () => {
    const [d] = problems(`lineledger: 1\nnotes: "${'x'.repeat(300)}"\n${TAIL}`, {
      limits: { maxBytes: 200 },
    });
    expect(d).toMatchObject({ code: 'file-too-large', line: 1, col: 1 });
    expect(d?.message).toContain('limit is 200 bytes');
  });

  it('stops a billion-laughs alias chain quickly, at the first alias over the limit', () => {
    const text = ['lineledger: 1', 'a0: &a0 [lol, lol, lol, lol, lol, lol, lol, lol, lol, lol]'];
    for (let i = 1; i < 10; i++)
      text.push(
        `a${i}: &a${i} [${Array(10)
          .fill(`*a${i - 1}`)
          .join(', ')}]`,
      );
    const ds = problems(`${text.join('\n')}\n${TAIL}`);
    expect(ds).toHaveLength(1);
    // The 51st alias: five lines of ten after a0 … a5 has its first.
    expect(ds[0]).toMatchObject({ code: 'yaml-aliases', line: 8, col: 10 });
    expect(ds[0]?.message).toContain('the limit is 50');
  });

  it('stops an alias chain that stays under the use limit but expands exponentially', () => {
    const text = ['lineledger: 1', 'a0: &a0 [x, x, x, x, x]'];
    for (let i = 1; i < 10; i++)
      text.push(
        `a${i}: &a${i} [${Array(5)
          .fill(`*a${i - 1}`)
          .join(', ')}]`,
      );
    const [d] = problems(`${text.join('\n')}\n${TAIL}`);
    expect(d).toMatchObject({ code: 'yaml-aliases', line: 11 });
    expect(d?.message).toContain(`limit is ${SESSION_LIMITS.maxExpandedValues}`);
  });

  it('refuses self-referring and dangling aliases at the alias', () => {
    expect(problems(`lineledger: 1\nsite: &s {name: *s}\n${TAIL}`)[0]).toMatchObject({
      code: 'yaml-aliases',
      line: 2,
      col: 17,
    });
    expect(problems(`lineledger: 1\nsite: {name: *nowhere}\n${TAIL}`)[0]?.message).toContain('*nowhere');
  });

  it('refuses deep nesting, in flow and block style, at the level over the limit', () => {
    const flow = problems(`lineledger: 1\nx: ${'['.repeat(30)}${']'.repeat(30)}\n${TAIL}`);
    // Level 1 is the top mapping, so the 20th bracket (column 4 + 19) opens level 21.
    expect(flow[0]).toMatchObject({ code: 'too-deep', line: 2, col: 23 });
    let block = 'lineledger: 1\nx:\n';
    for (let i = 1; i < 30; i++) block += `${'  '.repeat(i)}-\n`;
    expect(problems(block)[0]?.code).toBe('too-deep');
    const runaway = problems(`lineledger: 1\nx: ${'['.repeat(1_000_000)}`);
    expect(runaway[0]).toMatchObject({ code: 'too-deep', line: 2 });
  });

  it('refuses more lines entries than the limit, at the lines key, and agrees with the schema', () => {
    expect((SessionSchema.properties.lines as { maxItems?: number }).maxItems).toBe(SESSION_LIMITS.maxLines);
    const many = `lineledger: 1\nlines:\n${'  - {wavelength: 500}\n'.repeat(SESSION_LIMITS.maxLines + 1)}`;
    const [d] = problems(many);
    expect(d).toMatchObject({ code: 'too-many-lines', field: 'lines', line: 2, col: 1 });
    expect(d?.message).toBe(
      `the session has ${SESSION_LIMITS.maxLines + 1} lines entries; the limit is ${SESSION_LIMITS.maxLines}`,
    );
    expect(
      readSessionText(`lineledger: 1\nlines:\n${'  - {wavelength: 500}\n'.repeat(3)}`, 'ok.yaml').ok,
    ).toBe(true);
  });

  it('refuses a mapping with thousands of keys (the parser’s own check would take minutes)', () => {
    const keys = Array.from({ length: 20_000 }, (_, i) => `k${i}: 1`).join('\n');
    const [d] = problems(`lineledger: 1\n${keys}\n${TAIL}`);
    expect(d).toMatchObject({ code: 'too-many-keys', line: 1, col: 1 });
  });

  it('says how long an over-long text is and what the limit is', () => {
    const [d] = problems(`lineledger: 1\ntitle: ${'t'.repeat(301)}\n${TAIL}`);
    expect(d).toMatchObject({ code: 'too-long', field: 'title', line: 2, col: 8 });
    expect(d?.message).toBe('is 301 characters long; the limit is 300');
    const label = problems(
      `lineledger: 1\nlines:\n  - { wavelength: 500, label: "${'é'.repeat(201)}" }\n`,
    )[0];
    expect(label?.message).toBe('is 201 characters long; the limit is 200');
  });
});

describe('encodings and YAML pitfalls', () => {
  const utf8 = (s: string) => new TextEncoder().encode(s);

  it('points at the first byte that is not UTF-8, and names UTF-16', () => {
    const latin1 = new Uint8Array([...utf8('lineledger: 1\ntitle: caf'), 0xe9, ...utf8(`\n${TAIL}`)]);
    const [d] = problems(latin1);
    expect(d).toMatchObject({ code: 'not-utf8', line: 2, col: 11 });
    expect(d?.message).toContain('0xe9');
    const utf16 = new Uint8Array([0xff, 0xfe, ...utf8('l')]);
    expect(problems(utf16)[0]?.message).toContain('UTF-16');
  });

  it('accepts a byte-order mark and CRLF line ends, with positions unchanged', () => {
    const text = `\ufefflineledger: 1\r\nlines:\r\n  - wavelength: 500\r\n    intensty: 3\r\n`;
    expect(problems(utf8(text))[0]).toMatchObject({ code: 'unknown-key', line: 4, col: 5 });
    expect(readSessionText(utf8(`\ufefflineledger: 1\r\n${TAIL}`), 'b.yaml').ok).toBe(true);
  });

  it('says plainly that tabs cannot indent YAML', () => {
    const [d] = problems('lineledger: 1\nsource:\n\tkind: lamp\nlines: [{wavelength: 500}]\n');
    expect(d).toMatchObject({ code: 'tab-indent', line: 3, col: 1 });
    expect(d?.message).toContain('YAML allows only spaces for indentation');
  });

  it('names a duplicate key and points at its second use', () => {
    const [d] = problems('lineledger: 1\nlines:\n  - {wavelength: 500, wavelength: 501}\n');
    expect(d).toMatchObject({ code: 'duplicate-key', line: 3, col: 23 });
    expect(d?.message).toContain('"wavelength"');
  });

  it('refuses a NUL byte, an empty file and a second document, each at a position', () => {
    expect(problems('lineledger: 1\nti\u0000tle: x\n')[0]).toMatchObject({
      code: 'binary-content',
      line: 2,
      col: 3,
    });
    expect(problems('# only a comment\n')[0]?.code).toBe('empty-file');
    expect(problems(`lineledger: 1\n${TAIL}---\nlineledger: 1\n`)[0]).toMatchObject({
      code: 'multiple-documents',
      line: 3,
    });
  });
});

describe('session ids', () => {
  for (const id of ['../x', 'a/b', 'CON', '', 'a'.repeat(200), 'a b', '-x']) {
    it(`refuses the id ${JSON.stringify(id.length > 20 ? `${id.slice(0, 8)}…(${id.length})` : id)}`, () => {
      const ds = problems(`lineledger: 1\nid: "${id}"\n${TAIL}`);
      expect(ds[0]).toMatchObject({ field: 'id', line: 2, col: 5 });
    });
  }

  it('refuses Windows device names even in lower case', () => {
    expect(problems(`lineledger: 1\nid: con\n${TAIL}`)[0]).toMatchObject({
      code: 'reserved-id',
      line: 2,
      col: 5,
    });
    expect(problems(`lineledger: 1\nid: lpt1\n${TAIL}`)[0]?.code).toBe('reserved-id');
  });

  it('derives a safe id from a file name with odd characters', () => {
    expect(safeIdFromFileName('../We ird$$ Näme (1).yaml')).toBe('we-ird-n-me-1');
    // A name with nothing an id can hold gets a hashed id, so two such files stay apart.
    expect(safeIdFromFileName('/x/???.yml')).toMatch(/^session-[0-9a-f]{8}$/);
    expect(safeIdFromFileName('C:\\sessions\\CON.yaml')).toBe('con-session');
    expect(safeIdFromFileName(`${'Z'.repeat(300)}.yaml`)).toMatch(/^z{80}$/);
    for (const name of ['../We ird$$/ CON?*.yaml', 'ü.yaml', '.yaml', '--.yaml']) {
      const r = readSessionText(`lineledger: 1\n${TAIL}`, name);
      if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
      expect(r.value.id).toMatch(/^[a-z0-9]([a-z0-9-]{0,78}[a-z0-9])?$/);
    }
  });
});
