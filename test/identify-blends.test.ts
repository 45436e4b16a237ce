/**
 * Reference lines closer than the resolution become one blend, but a blend spans at most one
 * resolution element: lines each within reach of the next must not chain into one "line" far from
 * any of them.
 */
import { describe, expect, it } from 'vitest';
import { refsInRange } from '../src/identify/prepare.js';
import { bundledCatalog } from './helpers/catalog.js';

describe('blends of reference lines', () => {
  it('Fe II 500.3–502.0 nm at 1.5 nm resolution: 501.98 nm stays its own line (NIST ASD Fe II, retrieved 2020-04-23)', () => {
    const fe = bundledCatalog().species.get('Fe II');
    if (!fe) throw new Error('no Fe II');
    // Vacuum wavelengths of the table: 500.33482, 500.55840 and 501.98351 nm (the multiplet-42
    // line at 501.84 nm air), each within 1.5 nm of the next but spanning 1.65 nm.
    const refs = refsInRange(fe, 499.5, 502.5, 1.5);
    const near = refs.find((r) => Math.abs(r.vacuum_nm - 501.98351) < 0.01);
    expect(near?.members).toBe(1);
    for (const r of refs) {
      const span = 2 * Math.sqrt(Math.max(0, r.unc_nm ** 2 - 0.00001 ** 2));
      expect(span).toBeLessThan(1.5);
    }
    // Closer than one element, they are still one blend: 500.33 and 500.56 nm.
    expect(refs.some((r) => r.members >= 2 && r.vacuum_nm > 500.3 && r.vacuum_nm < 500.6)).toBe(true);
  });
});
