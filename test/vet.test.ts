/** `lineledger vet`: the pure per-file check and the command line (exit codes, output formats). */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { markDuplicateIds, summaryLine, vetSession } from '../src/commands/vet.js';
import { bundledCatalog } from './helpers/catalog.js';

const CLI = join(process.cwd(), 'dist', 'cli.js');
const bytes = (s: string) => new TextEncoder().encode(s);

function run(args: string[], cwd = process.cwd()) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8', cwd });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

function folder(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'll-vet-'));
  for (const [name, text] of Object.entries(files)) {
    mkdirSync(join(dir, name, '..'), { recursive: true });
    writeFileSync(join(dir, name), text);
  }
  return dir;
}

const GOOD =
  'lineledger: 1\nsource: { kind: lamp }\nmeasurement: { sigma: 0.3 }\nlines:\n  - wavelength: 546.1\n';

describe('vetSession (pure)', () => {
  it('passes a good session with no diagnostics', () => {
    const r = vetSession('good.yaml', bytes(GOOD), bundledCatalog());
    expect(r).toMatchObject({ ok: true, id: 'good', diagnostics: [] });
  });

  it('counts reduction problems, not only reading ones', () => {
    // Reads fine, but a negative angle in a positive order gives a negative wavelength.
    const text =
      'lineledger: 1\nmeasurement:\n  method: grating-angle\n  grating: { lines_per_mm: 600 }\n  sigma: 0.05\nlines:\n  - angle_deg: -10\n  - angle_deg: 10\n';
    const r = vetSession('far.yaml', bytes(text), bundledCatalog());
    expect(r.ok).toBe(false);
    expect(r.diagnostics.find((d) => d.severity === 'error')).toMatchObject({ code: 'order-sign', line: 7 });
  });

  it('warns about unknown candidate species at their place in the file', () => {
    const text = `${GOOD}candidates:\n  species: [Hg I, Xx IV]\n`;
    const r = vetSession('cand.yaml', bytes(text), bundledCatalog());
    expect(r.ok).toBe(true);
    const w = r.diagnostics.find((d) => d.code === 'unknown-candidate');
    expect(w).toMatchObject({ severity: 'warning', field: 'candidates.species[1]', line: 7 });
  });

  it('gives later files with the same id an error', () => {
    const catalog = bundledCatalog();
    const a = vetSession('a/x.yaml', bytes(GOOD), catalog);
    const b = vetSession('b/x.yaml', bytes(GOOD), catalog);
    const [first, second] = markDuplicateIds([a, b]);
    expect(first?.ok).toBe(true);
    expect(second?.ok).toBe(false);
    expect(second?.diagnostics.at(-1)?.code).toBe('duplicate-id');
    expect(summaryLine([first!, second!])).toBe('2 files checked: 1 clean, 1 with problems');
  });
});

describe('vet: a default uncertainty is said, once', () => {
  const warned = (text: string) =>
    vetSession('s.yaml', bytes(text), bundledCatalog()).diagnostics.filter((d) => d.code === 'assumed-sigma');

  it('for angles: one warning at measurement, naming the default (1 arcminute)', () => {
    const w = warned(
      'lineledger: 1\nmeasurement:\n  method: grating-angle\n  grating: { lines_per_mm: 300 }\nlines:\n  - angle_deg: 9.43\n  - angle_deg: 10.9\n',
    );
    expect(w).toHaveLength(1);
    expect(w[0]).toMatchObject({ severity: 'warning', field: 'measurement.sigma', line: 3, col: 3 });
    expect(w[0]!.message).toBe(
      'no reading uncertainty given for any line; assuming σ = 1′ (0.017°) per angle reading',
    );
  });
  it('for screen positions, counting only the lines that lack one', () => {
    const w = warned(
      'lineledger: 1\nmeasurement:\n  method: screen\n  grating: { lines_per_mm: 300 }\n  screen_distance_mm: 500\nlines:\n  - { offset_mm: 82, sigma: 0.5 }\n  - offset_mm: 95\n',
    );
    expect(w.map((d) => d.message)).toEqual([
      'no reading uncertainty given for 1 of the 2 lines; assuming σ = 1 mm per screen position',
    ]);
  });
  it('for pixels, counting the calibration lines too', () => {
    const w = warned(
      'lineledger: 1\nmeasurement:\n  method: pixel\n  calibration:\n    lines:\n      - { pixel: 100, wavelength: 435.8 }\n      - { pixel: 500, wavelength: 546.1 }\n      - { pixel: 700, wavelength: 577.0, pixel_sigma: 0.2 }\nlines:\n  - { pixel: 300, sigma: 0.3 }\n',
    );
    expect(w.map((d) => d.message)).toEqual([
      'no reading uncertainty given for 2 calibration lines; assuming σ = 0.5 px per pixel position',
    ]);
  });
  it('not when measurement.sigma is given', () => {
    expect(
      warned(
        'lineledger: 1\nmeasurement:\n  method: grating-angle\n  grating: { lines_per_mm: 300 }\n  sigma: 0.02\nlines:\n  - angle_deg: 9.43\n',
      ),
    ).toEqual([]);
  });
  it('angle_deg beside angle_left_deg is an error, not one of them dropped silently', () => {
    const r = vetSession(
      's.yaml',
      bytes(
        'lineledger: 1\nmeasurement:\n  method: grating-angle\n  grating: { lines_per_mm: 300 }\n  sigma: 0.02\nlines:\n  - { angle_deg: 9.43, angle_left_deg: 170.5, angle_right_deg: 189.4 }\n',
      ),
      bundledCatalog(),
    );
    expect(r.ok).toBe(false);
    expect(r.diagnostics.find((d) => d.code === 'conflicting-keys')).toMatchObject({
      field: 'lines[0].angle_deg',
      line: 7,
    });
  });
});

describe('vet: wavelengths the instrument cannot have measured', () => {
  const ranged = (text: string) =>
    vetSession('s.yaml', bytes(text), bundledCatalog()).diagnostics.filter((d) => d.code === 'out-of-range');
  // Hg I 404.656, 435.833, 546.074 nm in air (NIST Atomic Spectra Database).
  const HG_NM = [404.656, 435.833, 546.074];

  it('readings in Ångström under unit: nm: one warning at the unit, naming the unit that fits', () => {
    const lines = HG_NM.map((nm) => `  - wavelength: ${Math.round(nm * 10)}`).join('\n');
    const w = ranged(
      `lineledger: 1\nsource: { kind: lamp }\nmeasurement: { unit: nm, sigma: 0.3 }\nlines:\n${lines}\n`,
    );
    expect(w).toHaveLength(1);
    expect(w[0]).toMatchObject({ severity: 'warning', field: 'measurement.unit', line: 3, col: 22 });
    // 1 Å = 0.1 nm (SI Brochure, 8th edition, Table 8; from memory).
    expect(w[0]!.hint).toBe('4047 looks like Ångström: 404.7 nm — set measurement.unit: angstrom');
    expect(w[0]!.message).toContain('common practice');
  });

  it('one reading in Ångström among nm readings: a warning at that line', () => {
    const w = ranged(
      'lineledger: 1\nsource: { kind: lamp }\nmeasurement: { sigma: 0.3 }\nlines:\n  - wavelength: 404.7\n  - wavelength: 4358\n',
    );
    expect(w.map((d) => [d.field, d.line, d.col])).toEqual([['lines[1]', 6, 5]]);
    expect(w[0]!.hint).toContain('4358 looks like Ångström: 435.8 nm');
  });

  it('a second-order reading left at order 1: names the order that brings it in', () => {
    // Grating equation at normal incidence, d·sin θ = m·λ (Hecht, Optics): the 546.074 nm
    // line in order 2 on 300 lines/mm, and the 435.833 nm line in order 1 beside it.
    const d_nm = 1e6 / 300;
    const angle = (nm: number, m: number) => ((Math.asin((m * nm) / d_nm) * 180) / Math.PI).toFixed(4);
    const text = `lineledger: 1\nsource: { kind: lamp }\nmeasurement:\n  method: grating-angle\n  grating: { lines_per_mm: 300 }\n  sigma: 0.02\nlines:\n  - angle_deg: ${angle(HG_NM[1]!, 1)}\n  - angle_deg: ${angle(HG_NM[2]!, 2)}\n`;
    const w = ranged(text);
    expect(w.map((x) => [x.field, x.line])).toEqual([['lines[1]', 9]]);
    expect(w[0]!.message).toMatch(/^reduces to 1092\.\d nm, outside 380–780 nm, what the eye sees/);
    expect(w[0]!.hint).toMatch(/^order 2 would give 546\.\d nm/);
    // Read as order 2, it is in range and nothing is said.
    expect(ranged(text.replace(/(angle_deg: [\d.]+)\n$/, '$1\n    order: 2\n'))).toEqual([]);
  });

  it('uses the instrument range when the session states one', () => {
    const w = ranged(
      'lineledger: 1\nsource: { kind: lamp }\ninstrument: { range_nm: [400, 700] }\nmeasurement: { sigma: 0.3 }\nlines:\n  - wavelength: 546.1\n  - wavelength: 766.5\n',
    );
    expect(w.map((d) => d.field)).toEqual(['lines[1]']);
    expect(w[0]!.message).toBe("reduces to 766.5 nm, outside the instrument's range (400–700 nm)");
  });

  it('says nothing for lines inside the range', () => {
    const lines = HG_NM.map((nm) => `  - wavelength: ${nm}`).join('\n');
    expect(
      ranged(`lineledger: 1\nsource: { kind: lamp }\nmeasurement: { sigma: 0.3 }\nlines:\n${lines}\n`),
    ).toEqual([]);
  });
});

describe('lineledger vet (command line)', () => {
  it('passes every demo session with exit 0 and a summary line', () => {
    const n = readdirSync('data/sessions').filter((f) => /\.ya?ml$/.test(f)).length;
    const r = run(['vet', 'data/sessions']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toContain(`${n} files checked: ${n} clean, 0 with problems`);
  });

  it('prints problems compiler style with the source line and a caret, and exits 1', () => {
    const dir = folder({
      'bad.yaml': 'lineledger: 1\nlines:\n  - wavelength: 500\n    intensty: 3\n',
      'good.yml': GOOD,
    });
    const r = run(['vet', dir]);
    expect(r.code).toBe(1);
    const file = join(dir, 'bad.yaml');
    expect(r.stderr).toContain(
      `${file}:4:5: error[unknown-key] lines[0].intensty: unknown key "intensty" — did you mean "intensity"?`,
    );
    expect(r.stderr).toContain(' 4 |     intensty: 3\n   |     ^');
    expect(r.stderr).toContain('2 files checked: 1 clean, 1 with problems');
  });

  it('looks into sub-folders only with --recursive', () => {
    const dir = folder({ 'top.yaml': GOOD, 'deeper/bad.yaml': 'lineledger: 2\nlines: []\n' });
    expect(run(['vet', dir]).code).toBe(0);
    const deep = run(['vet', '--recursive', dir]);
    expect(deep.code).toBe(1);
    expect(deep.stderr).toContain('2 files checked: 1 clean, 1 with problems');
  });

  it('prints a JSON document for machines with --format json', () => {
    const dir = folder({ 'a.yaml': GOOD, 'b.yaml': 'lineledger: 1\nlines:\n  - wavelength: -1\n' });
    const r = run(['vet', '--format', 'json', dir]);
    expect(r.code).toBe(1);
    const doc = JSON.parse(r.stdout);
    expect(doc.summary).toMatchObject({ files: 2, clean: 1, with_problems: 1, errors: 1 });
    expect(doc.files.map((f: { ok: boolean }) => f.ok)).toEqual([true, false]);
    expect(doc.files[1].diagnostics[0]).toMatchObject({
      file: join(dir, 'b.yaml'),
      line: 3,
      col: 17,
      code: 'invalid-value',
      field: 'lines[0].wavelength',
    });
  });

  it('exits 2 when it cannot run: a missing path or an unreadable config', () => {
    const missing = run(['vet', join(tmpdir(), 'no-such-folder-for-vet')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('cannot find');
    const dir = folder({ 'a.yaml': GOOD });
    expect(run(['vet', '--config', join(dir, 'missing.yaml'), dir]).code).toBe(2);
    expect(run(['vet', '--format', 'xml', dir]).code).toBe(2);
  });
});
