/** Profiles end to end: a camera profile of Hg I lines through calibration and identification. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { vetSession } from '../../src/commands/vet.js';
import { readProfileInput } from '../../src/input/sessionFiles.js';
import { runSession } from '../../src/pipeline.js';
import { buildResult } from '../../src/report/result.js';
import { profileFileOf } from '../../src/session/profile/ref.js';
import { sessionTemplate } from '../../src/session/scaffold.js';
import { bundledCatalog } from '../helpers/catalog.js';
import { expectedCounts, poissonProfile } from '../helpers/profile.js';

const catalog = bundledCatalog();
// Hg I air wavelengths, NIST ASD (as in the bundled catalog): 404.656, 435.833, 546.074, 576.960, 579.066 nm.
const HG_AIR_NM = [404.656, 435.833, 546.074, 576.96, 579.066];
const NM0 = 380;
const NM_PER_PX = 0.12;
const px = (nm: number) => (nm - NM0) / NM_PER_PX;

function cameraProfile(): string {
  const lines = HG_AIR_NM.map((nm, i) => ({
    centre_px: px(nm),
    photons: i === 1 ? 8000 : 30_000,
    sigma_px: 2,
  }));
  const y = poissonProfile(expectedCounts(2048, lines, 40), 21);
  return `# pixel, counts\n${y.map((v, i) => `${i},${v}`).join('\n')}\n`;
}

function sessionText(extra = ''): string {
  const cal = [404.656, 546.074, 579.066]
    .map((nm) => `      - { pixel: ${px(nm).toFixed(2)}, wavelength: ${nm}, pixel_sigma: 0.05 }`)
    .join('\n');
  return `lineledger: 1
source: { kind: lamp, class: fluorescent }
medium: air
measurement:
  method: pixel
  calibration:
    degree: 1
    lines:
${cal}
profile:
  file: frame.csv
${extra}`;
}

function run(profileText: string, session = sessionText()) {
  const dir = mkdtempSync(join(tmpdir(), 'profile-e2e-'));
  writeFileSync(join(dir, 'frame.csv'), profileText);
  const path = join(dir, 'hg.yaml');
  writeFileSync(path, session);
  const bytes = new TextEncoder().encode(session);
  const profile = readProfileInput(path, bytes, profileFileOf);
  return { path, bytes, profile, out: runSession(path, bytes, catalog, { profile }) };
}

describe('a camera profile through the pipeline', () => {
  it('finds the five Hg I lines, calibrates them and identifies Hg I', () => {
    const { out } = run(cameraProfile());
    if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
    expect(out.reduction.profile?.lines.length).toBe(5);
    expect(out.reduction.lines.length).toBe(5);
    out.reduction.lines.forEach((l, i) => {
      expect(Math.abs(l.air_nm - HG_AIR_NM[i]!)).toBeLessThan(Math.max(4 * l.sigma_nm, 0.01));
    });
    const r = buildResult(out.reduction, out.identification, catalog, 'test');
    expect(r.explanation.species).toEqual(['Hg I']);
    expect(r.profile?.lines.length).toBe(5);
    expect(r.profile?.axis).toBe('pixel');
    expect(r.lines.filter((l) => l.status === 'identified').length).toBeGreaterThanOrEqual(4);
  });

  it('profile.drop leaves a line out, and the rest still identify', () => {
    const { out } = run(cameraProfile(), sessionText(`  drop: [${px(435.833).toFixed(1)}]\n`));
    if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
    expect(out.reduction.lines.length).toBe(4);
    expect(out.reduction.profile?.dropped.length).toBe(1);
  });

  it('profile.edit labels a found line and gives it another σ; an edit that matches none warns at its own line', () => {
    const at = px(546.074);
    const { out } = run(
      cameraProfile(),
      sessionText(
        `  edit:\n    - { at: ${at.toFixed(1)}, label: green, sigma: 0.5 }\n    - { at: 5, label: nothing there }\n`,
      ),
    );
    if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
    const green = out.reduction.lines.find((l) => l.label === 'green');
    expect(green).toBeDefined();
    expect(Math.abs((green?.air_nm ?? 0) - 546.074)).toBeLessThan(0.05);
    // σ of 0.5 px through the fit's dispersion (0.12 nm/px): about 0.06 nm, far above the fit's own.
    expect(green?.sigma_nm).toBeGreaterThan(0.05);
    const others = out.reduction.lines.filter((l) => l !== green);
    for (const l of others) expect(l.sigma_nm).toBeLessThan(0.05);
    const unmatched = out.warnings.find((w) => w.code === 'profile-edit-unmatched');
    expect(unmatched?.field).toBe('profile.edit');
    // The second edit is line 16 of the session text (13 lines of set-up and profile.file, then edit: and the first).
    expect(unmatched?.line).toBe(16);
  });

  it('vet reports a profile whose axis doubles back, at profile.file', () => {
    const bad = `${cameraProfile()}5,100\n`;
    const { path, bytes, profile } = run(bad);
    const v = vetSession(path, bytes, catalog, { profile });
    expect(v.ok).toBe(false);
    const d = v.diagnostics.find((x) => x.code === 'profile-not-monotonic');
    expect(d?.field).toBe('profile.file');
    expect(d?.line).toBe(13);
  });

  it('a flat profile has no lines: an error that says what to change', () => {
    const flat = Array.from({ length: 500 }, (_, i) => `${i},100`).join('\n');
    const { out } = run(flat);
    expect(!out.ok && out.diagnostics[0]?.code).toBe('profile-no-lines');
  });

  it('the `new --method profile` template, filled in, reads and finds the lines', () => {
    const cal = [404.656, 546.074, 579.066];
    const fills: Record<string, string[]> = {
      title: ['"Camera frame"'],
      observer: ['Test bench'],
      kind: ['lamp'],
      description: ['webcam behind a 600 lines/mm grating'],
      pixel: cal.map((nm) => px(nm).toFixed(2)),
      wavelength: cal.map(String),
      file: ['frame.csv'],
    };
    const used = new Map<string, number>();
    const text = sessionTemplate({
      method: 'profile',
      date: '2031-07-09',
      id: 'frame',
      schemaRef: 'x',
    }).replace(/([a-z_]+): ~/g, (_all, key: string) => {
      const n = used.get(key) ?? 0;
      used.set(key, n + 1);
      return `${key}: ${fills[key]![n]}`;
    });
    const { out } = run(cameraProfile(), text);
    if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
    expect(out.reduction.lines.length).toBe(5);
  });
});
