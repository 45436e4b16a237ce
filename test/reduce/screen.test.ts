import { describe, expect, it } from 'vitest';
import { vacuumPerAirSlope } from '../../src/reduce/airVacuum.js';
import {
  expectPositioned,
  failures,
  gaussian,
  mulberry32,
  reduced,
  reduceFailures,
  sessionOf,
  standardDeviation,
} from './helpers.js';

const session = (lines: string, distance = 'screen_distance_mm: 1000') => `lineledger: 1
measurement:
  method: screen
  grating: { lines_per_mm: 300 }
  ${distance}
lines:
${lines}`;

describe('screen geometry', () => {
  // Worked example (common practice): 300 lines/mm, screen 1000 mm away; Hg 546.074 nm sits at
  // x = L·tan(asin(λ/d)) = 166.1 mm from the central maximum in first order.
  it('546.074 nm at 166.1 mm on a screen 1000 mm away', () => {
    const r = reduced(session('  - offset_mm: 166.1\n'));
    // x is given to 0.1 mm: ±0.05 mm is ±0.16 nm here.
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.17);
  });

  it('a separation between ±1 maxima gives the same line (x = s / 2)', () => {
    const r = reduced(session('  - separation_mm: 332.2\n'));
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.17);
  });

  it('an offset on the negative side needs order −1', () => {
    expect(
      Math.abs(reduced(session('  - offset_mm: -166.1\n    order: -1\n')).lines[0]!.air_nm - 546.074),
    ).toBeLessThan(0.17);
    expect(
      failures(session('  - offset_mm: -166.1\n')).some(
        (d) => d.code === 'order-sign' && d.field === 'lines[0].offset_mm',
      ),
    ).toBe(true);
  });

  it('σ from x and L matches a Monte-Carlo spread within 10 %', () => {
    const x = 250;
    const sx = 2;
    const L = 800;
    const sL = 5;
    const r = reduced(
      session(
        `  - offset_mm: ${x}\n    sigma: ${sx}\n`,
        `screen_distance_mm: ${L}\n  screen_distance_sigma_mm: ${sL}`,
      ),
    );
    const normal = gaussian(mulberry32(20260314));
    const d = 1e6 / 300;
    // Independent forward model: λ = d·sin(atan(x/L)) = d·x/√(x² + L²).
    const samples = Array.from({ length: 20000 }, () => {
      const xi = x + sx * normal();
      const Li = L + sL * normal();
      return (d * xi) / Math.hypot(xi, Li);
    });
    // reduce reports the σ of the vacuum wavelength: undo the air→vacuum slope for the air-side check.
    const sigmaAir = r.lines[0]!.sigma_nm / vacuumPerAirSlope(r.lines[0]!.air_nm);
    expect(Math.abs(sigmaAir / standardDeviation(samples) - 1)).toBeLessThan(0.1);
  });
});

describe('screen bad input', () => {
  it('zero or negative screen distances are rejected with their position', () => {
    for (const distance of ['screen_distance_mm: 0', 'screen_distance_mm: -500']) {
      const d = expectPositioned(
        failures(session('  - offset_mm: 100\n', distance)),
        'invalid-value',
        'measurement.screen_distance_mm',
      );
      expect(d.line).toBe(5);
    }
  });

  it('a missing screen distance is a diagnostic', () => {
    expectPositioned(failures(session('  - offset_mm: 100\n', '')), 'missing-key');
  });

  it('the reducer guards the distance when handed a Session directly', () => {
    const s = sessionOf(session('  - offset_mm: 100\n'));
    const broken = { ...s, measurement: { ...s.measurement, screen_distance_mm: -1 } };
    expectPositioned(reduceFailures(broken), 'invalid-value', 'measurement.screen_distance_mm');
  });

  it('a negative separation is rejected at its line', () => {
    const d = failures(session('  - separation_mm: -10\n'));
    expect(d.some((x) => x.field.startsWith('lines[0]') && x.line === 7)).toBe(true);
  });
});
