/** build --pdf's printer, on the committed demo site copied to a temporary folder. */
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { findChromium, printRecords } from '../src/pdf/printRecords.js';

const browser = findChromium();
if (!browser && process.env.CI)
  throw new Error('CI must have Debian chromium installed (.ci/run installs it)');

describe('finding a browser', () => {
  it('honours LINELEDGER_CHROMIUM and says none when it points nowhere', () => {
    expect(findChromium({ LINELEDGER_CHROMIUM: '/nonexistent/chrome' })).toBeNull();
  });
});

describe.skipIf(!browser)('PDF records', () => {
  it('writes one multi-page PDF per session', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'll-pdf-'));
    cpSync('site', dir, { recursive: true });
    const ids = readdirSync(join(dir, 'sessions')).slice(0, 2);
    const result = await printRecords(dir, ids, 'A4', browser as string);
    expect(result.problems).toEqual([]);
    expect(result.written).toHaveLength(2);
    for (const f of result.written) {
      expect(existsSync(f)).toBe(true);
      const text = readFileSync(f).toString('latin1');
      expect(text.startsWith('%PDF-')).toBe(true);
      expect((text.match(/\/Type\s*\/Page[^s]/g) ?? []).length).toBeGreaterThanOrEqual(2);
    }
  }, 60_000);
});

describe('lineledger build --pdf', () => {
  const run = (env: Record<string, string>) => {
    const out = join(mkdtempSync(join(tmpdir(), 'll-pdfcli-')), 'site');
    const r = spawnSync(
      process.execPath,
      [join('dist', 'cli.js'), 'build', '--out', out, '--pdf', '--no-cache'],
      {
        encoding: 'utf8',
        env: { ...process.env, ...env },
      },
    );
    return { ...r, out };
  };
  it('says how to install Chromium when there is none, and exits 2', () => {
    const r = run({ LINELEDGER_CHROMIUM: '/nonexistent/chromium' });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('apt-get install chromium');
  }, 120_000);
  it.skipIf(!browser)(
    'writes record.pdf beside each record',
    () => {
      const r = run({});
      expect(r.status, r.stderr).toBe(0);
      for (const id of readdirSync(join(r.out, 'sessions')))
        expect(existsSync(join(r.out, 'sessions', id, 'record.pdf'))).toBe(true);
    },
    180_000,
  );
});
