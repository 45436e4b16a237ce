/** End to end through the real command line: build the demo, bad input, hostile notes. */
import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const CLI = join(process.cwd(), 'dist', 'cli.js');

function run(args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, [CLI, ...args], {
    encoding: 'utf8',
    env: { ...process.env, ...env },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function files(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else out.push(relative(dir, p));
    }
  };
  walk(dir);
  return out.sort();
}

describe('lineledger build (demo)', () => {
  const out = join(mkdtempSync(join(tmpdir(), 'll-demo-')), 'site');
  // Same as `npm run demo` (which reads ./lineledger.yaml), into a temporary folder.
  const built = run(['build', '--out', out]);

  it('builds every demo session, with the project config’s title and introduction', () => {
    expect(built.code, built.stderr).toBe(0);
    const index = readFileSync(join(out, 'index.html'), 'utf8');
    expect(index).toContain('<title>Hollins Lane Science Club — spectral line archive</title>');
    expect(index).toContain('prep room, optics bench');
    // Sessions, and the recorded profiles two of them name.
    for (const f of readdirSync('data/sessions')) expect(f).toMatch(/\.(yaml|csv|fits)$/);
  });

  it('identifies each demo session as its scenario says', () => {
    const expected: Record<string, string[]> = {
      'tube-b-2026-03-14': ['Hg I'],
      'tube-d-2026-03-21': ['He I', 'Hg I'],
      'vega-2026-05-09': ['H I'],
      'tube-e-2026-03-28': ['He I'],
      'lamp-screen-2026-04-16': ['Hg I'],
      'street-lamp-2026-04-24': ['Na I'],
      'tube-f-camera-2026-06-06': ['He I'],
      'star-k-2026-06-12': ['H I'],
    };
    for (const [id, species] of Object.entries(expected)) {
      const result = JSON.parse(readFileSync(join(out, 'sessions', id, 'result.json'), 'utf8'));
      expect(result.explanation.species, id).toEqual(species);
    }
    const camera = JSON.parse(
      readFileSync(join(out, 'sessions', 'street-lamp-2026-04-24', 'result.json'), 'utf8'),
    );
    expect(camera.calibration.degree).toBe(2);
    expect(readFileSync(join(out, 'sessions', 'street-lamp-2026-04-24', 'index.html'), 'utf8')).toContain(
      'Calibration',
    );
    const vega = JSON.parse(readFileSync(join(out, 'sessions', 'vega-2026-05-09', 'result.json'), 'utf8'));
    expect(vega.shift.barycentric.correction_km_s).toBeTypeOf('number');
    const flame = JSON.parse(
      readFileSync(join(out, 'sessions', 'flame-salt-c-2026-04-02', 'result.json'), 'utf8'),
    );
    expect(flame.explanation.species).toContain('Li I');
  });

  it('writes forbidden lines in brackets everywhere on the pages ([O III], never a bare O III)', () => {
    // The convention of nebular spectroscopy (Osterbrock & Ferland 2006, ch. 3; from memory):
    // a forbidden transition's species is bracketed. The demo quasar's explanation holds [O III].
    for (const page of ['index.html', 'sessions/quasar-2026-05-30/index.html']) {
      const html = readFileSync(join(out, page), 'utf8');
      expect(html, page).toContain('[O III]');
      expect(html.match(/(^|[^[])O III(?!\])/g), page).toBeNull();
    }
  });

  it('gives every session page an inline SVG chart and no script', () => {
    for (const f of files(out).filter((p) => p.endsWith('index.html') && p.startsWith('sessions'))) {
      const html = readFileSync(join(out, f), 'utf8');
      expect(html).toContain('<svg');
      expect(html).not.toMatch(/<script/i);
      expect(html).not.toMatch(/https?:\/\/[^"]*\.(js|css)/);
    }
  });

  it('reproduces the committed site/ byte for byte (deterministic build)', () => {
    const committed = files('site');
    expect(files(out)).toEqual(committed);
    for (const f of committed)
      expect(readFileSync(join(out, f), 'utf8'), f).toBe(readFileSync(join('site', f), 'utf8'));
  });
});

describe('bad input', () => {
  const dir = mkdtempSync(join(tmpdir(), 'll-bad-'));
  cpSync('data/sessions', dir, { recursive: true });
  writeFileSync(join(dir, 'broken-syntax.yaml'), 'lineledger: 1\nlines:\n  - { wavelength: 500\n');
  writeFileSync(join(dir, 'misspelt.yaml'), 'lineledger: 1\nlines:\n  - wavelength: 500\n    sigmaa: 1\n');
  writeFileSync(
    join(dir, 'same-id.yaml'),
    'lineledger: 1\nid: tube-b-2026-03-14\nlines:\n  - wavelength: 500\n',
  );
  writeFileSync(
    join(dir, 'hostile.yaml'),
    'lineledger: 1\ntitle: "<b>x</b> & \\"q\\""\nlines:\n  - { wavelength: 589.0, label: "<img src=x onerror=alert(1)>" }\nnotes: |\n  <script>alert(1)</script>\n\n  Text <img src=x onerror=alert(1)> [link](javascript:alert(1))\n\n  <iframe src="https://example.org"></iframe>\n',
  );
  // Beside the sessions folder: a site inside it is refused.
  const out = join(mkdtempSync(join(tmpdir(), 'll-bad-out-')), 'out');
  const r = run(['build', dir, '--out', out]);

  it('reports each bad file with file:line:col and still builds the others', () => {
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/broken-syntax\.yaml:\d+:\d+: error\[yaml-syntax\]/);
    expect(r.stderr).toMatch(
      /misspelt\.yaml:4:5: error\[unknown-key\] lines\[0\]\.sigmaa: .*did you mean "sigma"/,
    );
    expect(r.stderr).toMatch(/same-id\.yaml:1:1: error\[duplicate-id\]/);
    expect(existsSync(join(out, 'sessions', 'tube-b-2026-03-14', 'index.html'))).toBe(true);
    expect(readFileSync(join(out, 'index.html'), 'utf8')).toContain('misspelt.yaml');
  });

  it('lets no script, handler or javascript: URL from a note or a label into the page', () => {
    const html = readFileSync(join(out, 'sessions', 'hostile', 'index.html'), 'utf8');
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/\sonerror\s*=/i);
    expect(html).not.toMatch(/javascript:/i);
    expect(html).not.toMatch(/<iframe/i);
    expect(html).toContain('&lt;b&gt;x&lt;/b&gt; &amp; &quot;q&quot;');
  });
});

describe('lineledger identify', () => {
  const dir = mkdtempSync(join(tmpdir(), 'll-id-'));
  const file = join(dir, 'hg.yaml');
  // NIST ASD air wavelengths of Hg I rounded to 0.01 nm, σ 0.3 nm (the foundation issue's check).
  writeFileSync(
    file,
    `lineledger: 1\nlines:\n${[404.66, 435.83, 546.07, 576.96, 579.07].map((w) => `  - { wavelength: ${w}, sigma: 0.3 }\n`).join('')}`,
  );

  it('prints the result contract with --json, Hg I first', () => {
    const r = run(['identify', file, '--json']);
    expect(r.code, r.stderr).toBe(0);
    const result = JSON.parse(r.stdout);
    expect(result.candidates[0].species).toBe('Hg I');
    expect(result.lines).toHaveLength(5);
    expect(result.catalog.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it('prints a readable ranking without --json', () => {
    const r = run(['identify', file]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/^\s+1\s+Hg I/m);
  });

  it('exits 1 with a positioned message for a bad file and 2 for a missing one', () => {
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, 'lineledger: 1\nlines:\n  - wavelength: -3\n');
    const r = run(['identify', bad]);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('bad.yaml:3:17');
    expect(run(['identify', join(dir, 'nope.yaml')]).code).toBe(2);
  });
});
