// Faint catalog lines: kept (read from NIST ASD) for the assignment of leftover lines of a
// species the explanation holds, never weighed as evidence.
import { describe, expect, it } from 'vitest';
import type { Catalog } from '../src/lines/types.js';
import { runSession } from '../src/pipeline.js';
import { bundledCatalog } from './helpers/catalog.js';

const catalog = bundledCatalog();
const withoutFaint: Catalog = { ...catalog, faint: new Map() };

// The five classic Hg I lines (NIST ASD air wavelengths, from memory) and Hg I 491.607 nm air:
// NIST ASD Hg I table (HgI_vacuum.txt, retrieved 2016-04-21), observed 4917.440 Å vacuum,
// Ritz 4917.417 Å, Rel. Int. 20 — below the catalog's Hg I threshold of 30, so a faint row.
const STRONG = [404.656, 435.833, 546.074, 576.96, 579.066];
const FAINT_AIR = 491.607;

function mercury(sigma_nm: number, extra: number[] = [FAINT_AIR]) {
  const lines = [...STRONG, ...extra].map((w) => `  - { wavelength: ${w}, sigma: ${sigma_nm} }\n`).join('');
  return `lineledger: 1\nsource: { kind: lamp }\nlines:\n${lines}`;
}

function identifyWith(text: string, cat: Catalog) {
  const out = runSession('t.yaml', text, cat);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.identification;
}

describe('faint lines', () => {
  it('holds Hg I 491.744 nm (vacuum) as a faint row read from the NIST ASD table, apart from the weighed lines', () => {
    const faint = catalog.faint.get('Hg I');
    expect(faint).toBeDefined();
    const k = faint?.vacuum_nm.findIndex((v) => Math.abs(v - 491.744) < 0.0005) ?? -1;
    expect(k).toBeGreaterThanOrEqual(0);
    expect(faint?.intensity[k]).toBe(20);
    expect(faint?.origin[k]).toBe('read');
    expect(faint?.flags[k]).toContain('faint');
    expect(faint?.source[k]).toBe('nist-asd-hg-i-2016-04-21');
    const weighed = catalog.species.get('Hg I');
    expect(weighed?.vacuum_nm.some((v) => Math.abs(v - 491.744) < 0.0005)).toBe(false);
  });

  it('assigns a precise reading of that line to Hg I, identified, once Hg I is confirmed', () => {
    const idn = identifyWith(mercury(0.02), catalog);
    expect(idn.explanation.species).toEqual(['Hg I']);
    const line = idn.lines.find((l) => l.index === STRONG.length);
    expect(line?.status).toBe('identified');
    expect(line?.assignment?.species).toBe('Hg I');
    expect(line?.assignment?.flags).toContain('faint');
    expect(line?.assignment?.ref_vacuum_nm).toBeCloseTo(491.744, 3);
    expect(idn.explanation.unexplained).toEqual([]);
    // Without faint rows nothing gives it to Hg I (at best a tentative guess from another species).
    const plain = identifyWith(mercury(0.02), withoutFaint);
    const before = plain.lines.find((l) => l.index === STRONG.length);
    expect(before?.status).not.toBe('identified');
    expect(before?.assignment?.species).not.toBe('Hg I');
  });

  it('does not pin a coarse reading (σ 2 nm) on a faint line', () => {
    const idn = identifyWith(mercury(2), catalog);
    const line = idn.lines.find((l) => l.index === STRONG.length);
    expect(line?.status).not.toBe('identified');
  });

  it('never changes the evidence: scores and the explanation are those of the catalog without faint rows', () => {
    for (const sigma of [0.02, 0.5, 2]) {
      const a = identifyWith(mercury(sigma, [FAINT_AIR, 600.0]), catalog);
      const b = identifyWith(mercury(sigma, [FAINT_AIR, 600.0]), withoutFaint);
      expect(a.explanation.species).toEqual(b.explanation.species);
      expect(a.explanation.score).toBe(b.explanation.score);
      expect(a.candidates.map((c) => [c.species, c.score])).toEqual(
        b.candidates.map((c) => [c.species, c.score]),
      );
    }
  });
});
