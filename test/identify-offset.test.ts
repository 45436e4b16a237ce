/** A reading offset fitted as a nuisance parameter (issue 10), on published Hg I lines. */
import { describe, expect, it } from 'vitest';
import { runSession } from '../src/pipeline.js';
import { buildResult } from '../src/report/result.js';
import { bundledCatalog } from './helpers/catalog.js';

const catalog = bundledCatalog();

// Hg I air wavelengths 404.656, 435.833, 546.074, 576.960, 579.066 nm: NIST ASD Hg I lines
// (the bundled catalog's rows read from the NIST ASD table retrieved 2016-04-21).
const HG_AIR_NM = [404.656, 435.833, 546.074, 576.96, 579.066];

function result(offset_nm: number) {
  const lines = HG_AIR_NM.map((w) => `  - { wavelength: ${(w + offset_nm).toFixed(3)} }`).join('\n');
  const yaml = `lineledger: 1\nsource: { kind: lamp, class: fluorescent }\ninstrument: { resolution_nm: 1.5 }\nmeasurement: { method: wavelength, sigma: 0.3 }\nlines:\n${lines}\n`;
  const out = runSession('cfl.yaml', yaml, catalog);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return { out, r: buildResult(out.reduction, out.identification, catalog, 'test') };
}

describe('reading offset', () => {
  it('finds Hg I readings running 0.5 nm long, says so, and identifies on corrected values', () => {
    const { out, r } = result(0.5);
    const fit = r.scale_correction;
    expect(fit).not.toBeNull();
    expect(Math.abs((fit?.offset_nm ?? 0) - 0.5)).toBeLessThan(2 * (fit?.offset_sigma_nm ?? 0));
    expect(fit?.against).toEqual(['Hg I']);
    expect(r.explanation.species).toEqual(['Hg I']);
    const shifted = r.lines.filter((l) => l.assignment?.species === 'Hg I' && !l.assignment.blend);
    for (const l of shifted) expect(Math.abs(l.assignment?.residual_nm ?? 1)).toBeLessThan(0.1);
    const warning = out.ok ? out.warnings.find((w) => w.code === 'reading-offset') : undefined;
    expect(warning?.message).toMatch(/readings run 0\.\d\d ± 0\.\d\d nm long against Hg I/);
  });

  it('leaves readings that agree with the catalog alone', () => {
    expect(result(0).r.scale_correction).toBeNull();
  });

  it('finds readings running short as a negative offset', () => {
    const fit = result(-0.5).r.scale_correction;
    expect(fit).not.toBeNull();
    expect(Math.abs((fit?.offset_nm ?? 0) + 0.5)).toBeLessThan(2 * (fit?.offset_sigma_nm ?? 0));
  });
});
