/** A reading offset fitted as a nuisance parameter (issue 10), on published Hg I lines. */
import { describe, expect, it } from 'vitest';
import { offsetOccamCost } from '../src/identify/scaleOffset.js';
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

  it("charges the offset's Occam factor: the Laplace evidence ratio, checked by numerical integration", () => {
    // A Gaussian likelihood in the offset a, peaked at â with width σ, under the prior N(0, w²):
    // ln[ L(â) / ∫ L(a) N(a; 0, w²) da ] is what fitting a costs, integrated here by the
    // trapezoid rule on a fine grid (independent of the closed form in scaleOffset.ts).
    for (const [a, sigma, w] of [
      [0.5, 0.1, 1.5],
      [1.18, 0.39, 2],
      [0.05, 0.2, 0.5],
    ] as const) {
      const step = w / 2000;
      let integral = 0;
      for (let x = -12 * w; x <= 12 * w; x += step) {
        const like = Math.exp(-((x - a) ** 2) / (2 * sigma * sigma));
        const prior = Math.exp(-(x * x) / (2 * w * w)) / (w * Math.sqrt(2 * Math.PI));
        integral += like * prior * step;
      }
      // The fitted offset is the posterior mode; its likelihood there, L(mode), is what the gain measures.
      const s2 = 1 / (1 / (sigma * sigma) + 1 / (w * w));
      const mode = (a / (sigma * sigma)) * s2;
      const atMode = Math.exp(-((mode - a) ** 2) / (2 * sigma * sigma));
      const exact = Math.log(atMode / integral);
      const cost = offsetOccamCost(
        { offset_nm: mode, offset_sigma_nm: Math.sqrt(s2), scale: 0, lines_used: 2 },
        w,
      );
      expect(cost).toBeCloseTo(exact, 1);
    }
  });
});
