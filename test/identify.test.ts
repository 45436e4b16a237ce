import { describe, expect, it } from 'vitest';
import { runSession } from '../src/pipeline.js';
import { buildResult } from '../src/report/result.js';
import { bundledCatalog } from './helpers/catalog.js';

const catalog = bundledCatalog();

function session(lines: string, extra = ''): string {
  return `lineledger: 1\nsource: { kind: lamp }\n${extra}lines:\n${lines}`;
}

function identified(text: string) {
  const out = runSession('t.yaml', text, catalog);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return { out, result: buildResult(out.reduction, out.identification, catalog, 'test') };
}

describe('identification', () => {
  it('ranks Hg I first for the five classic mercury lines (NIST ASD air wavelengths, σ 0.3 nm)', () => {
    const lines = [404.66, 435.83, 546.07, 576.96, 579.07]
      .map((w) => `  - { wavelength: ${w}, sigma: 0.3 }\n`)
      .join('');
    const { result } = identified(session(lines));
    expect(result.candidates[0]?.species).toBe('Hg I');
    expect(result.explanation.species).toEqual(['Hg I']);
    expect(result.explanation.unexplained).toEqual([]);
    expect(result.status).toBe('identified');
    for (const l of result.lines) expect(l.assignment?.species).toBe('Hg I');
  });

  it('follows the result contract', () => {
    const { result } = identified(
      session(
        '  - { wavelength: 656.28, sigma: 0.2 }\n  - { wavelength: 486.13, sigma: 0.2 }\n  - { wavelength: 434.05, sigma: 0.2 }\n',
      ),
    );
    expect(result).toMatchObject({
      id: 't',
      catalog: { version: catalog.version, sha256: catalog.sha256 },
      shift: null,
      calibration: null,
    });
    const line = result.lines[0];
    expect(line).toBeDefined();
    for (const k of ['index', 'vacuum_nm', 'air_nm', 'sigma_nm'])
      expect(typeof (line as Record<string, unknown>)[k]).toBe('number');
    expect(Object.keys(line?.assignment ?? {})).toEqual(
      expect.arrayContaining(['species', 'ref_vacuum_nm', 'residual_nm']),
    );
    const c = result.candidates[0];
    for (const k of ['species', 'score', 'confidence', 'matched', 'expected', 'false_alarm'])
      expect(c).toHaveProperty(k);
    expect(result.explanation).toHaveProperty('species');
    expect(result.explanation).toHaveProperty('unexplained');
    // The air value is the vacuum value through the IAU conversion: Hα vacuum 656.46 nm.
    expect(line?.vacuum_nm).toBeCloseTo(656.461, 2);
  });

  it('explains a two-gas tube as both gases', () => {
    // NIST ASD air wavelengths of He I and Hg I lines, offsets of a few tenths as a hand spectroscope gives.
    const waves = [404.5, 436.0, 447.3, 501.4, 546.0, 587.8, 667.5];
    const lines = waves.map((w) => `  - { wavelength: ${w} }\n`).join('');
    const { result } = identified(
      session(lines, 'instrument: { resolution_nm: 2 }\nmeasurement: { sigma: 0.6 }\n'),
    );
    expect(result.explanation.species).toEqual(['He I', 'Hg I']);
  });

  it('leaves a line that no species explains unexplained', () => {
    const lines = [404.66, 435.83, 546.07, 576.96, 579.07, 520.5]
      .map((w) => `  - { wavelength: ${w}, sigma: 0.1 }\n`)
      .join('');
    const { result } = identified(session(lines, 'candidates: { species: [Hg I, He I, Ne I, H I] }\n'));
    expect(result.explanation.species).toEqual(['Hg I']);
    expect(result.explanation.unexplained).toEqual([5]);
  });

  it('does not let a dense spectrum win by numbers alone on random lines', () => {
    // Lines placed between the strong lines of the light species; Fe I must not be a confident answer.
    const lines = [412.3, 451.7, 478.9, 523.1, 561.4, 603.2, 641.9, 688.4]
      .map((w) => `  - { wavelength: ${w}, sigma: 0.5 }\n`)
      .join('');
    const { result } = identified(session(lines, 'candidates: { species: [Fe I, Hg I, He I, Na I] }\n'));
    const fe = result.candidates.find((c) => c.species === 'Fe I');
    expect(result.explanation.species).not.toContain('Fe I');
    expect(fe?.confidence ?? 0).toBeLessThan(0.5);
  });

  it('warns about a candidate species that does not exist', () => {
    const out = runSession(
      't.yaml',
      session('  - { wavelength: 589.0 }\n', 'candidates: { species: [Na 1] }\n'),
      catalog,
    );
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    const w = out.warnings.find((x) => x.code === 'unknown-candidate');
    expect(w?.hint).toContain('Na I');
    // It points at the misspelt name itself: line 3, inside the flow sequence.
    expect(w).toMatchObject({ line: 3, col: 25, field: 'candidates.species[0]' });
  });
});
