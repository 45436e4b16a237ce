import { describe, expect, it } from 'vitest';
import { vacuumPerAirSlope } from '../../src/reduce/airVacuum.js';
import { diffractionAngleDeg, solveGratingEquation } from '../../src/reduce/grating.js';
import { expectPositioned, failures, reduced, reduceFailures, sessionOf } from './helpers.js';

const session = (lines: string, extra = '') => `lineledger: 1
medium: air
measurement:
  method: grating-angle
  grating: { lines_per_mm: 300 }
  order: 1
${extra}lines:
${lines}`;

describe('grating equation, worked values', () => {
  // Worked example (common practice, textbook): 300 lines/mm → d = 3.333 µm; the Hg green line
  // 546.074 nm (air) is seen at θ = 9.429° in first order and 19.126° in second order.
  it('first order: 546.074 nm at θ = 9.429°', () => {
    const r = reduced(session('  - angle_deg: 9.429\n'));
    // θ is given to 0.001° (1.7e-5 rad): d·cos θ·1.7e-5 ≈ 0.06 nm of rounding in the check itself.
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.06);
  });

  it('second order: 546.074 nm at θ = 19.126°', () => {
    const r = reduced(session('  - angle_deg: 19.126\n    order: 2\n'));
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.06);
  });

  it('a negative order read on the negative side gives the same line', () => {
    const r = reduced(session('  - angle_deg: -9.429\n    order: -1\n'));
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.06);
  });

  it('two-sided readings θ = |L − R| / 2 cancel the table zero, also across 0°/360°', () => {
    // Zero offset 37.5°: L = 37.5 + 9.429, R = 37.5 − 9.429.
    const offset = reduced(session('  - angle_left_deg: 46.929\n    angle_right_deg: 28.071\n'));
    expect(Math.abs(offset.lines[0]!.air_nm - 546.074)).toBeLessThan(0.06);
    // σ of θ from two readings of σ = 1′ each: σ_θ = 1′/√2.
    const single = reduced(session('  - angle_deg: 9.429\n'));
    expect(offset.lines[0]!.sigma_nm / single.lines[0]!.sigma_nm).toBeCloseTo(1 / Math.SQRT2, 6);
  });

  it('angles written in degrees and minutes', () => {
    // 9° 25.74′ = 9.429°.
    const r = reduced(session(`  - angle_deg: "9° 25.74'"\n`));
    expect(Math.abs(r.lines[0]!.air_nm - 546.074)).toBeLessThan(0.06);
    expect(r.lines[0]!.reading_text).toContain('m = 1');
  });

  it('incidence: the forward and inverse equations agree (β = θ − α)', () => {
    const setup = { spacing_nm: 1e6 / 600, spacing_sigma_nm: 0, order: 2, incidence_deg: 12 };
    const beta = diffractionAngleDeg(setup, 486.135);
    expect(beta).not.toBeNull();
    const solved = solveGratingEquation(setup, (beta as number) + setup.incidence_deg, 0);
    expect(solved.ok && solved.wavelength_nm).toBeCloseTo(486.135, 9);
    // m·λ beyond d·(1 + sin α): no diffracted beam in that order.
    expect(diffractionAngleDeg(setup, 1600)).toBeNull();
  });

  it('reflection grating at oblique incidence: θ read from the specular beam', () => {
    // 1200 lines/mm, α = 20°: the specular beam leaves at −α, so a line at β from the normal is
    // read at θ = β + α. β from m·λ = d·(sin α + sin β) for Hg 546.074 nm, worked by hand here.
    const d = 1e6 / 1200;
    const beta = Math.asin(546.074 / d - Math.sin((20 * Math.PI) / 180));
    const theta = (beta * 180) / Math.PI + 20;
    const r = reduced(
      session(`  - angle_deg: ${theta}\n`, '  incidence_deg: 20\n').replace(
        '{ lines_per_mm: 300 }',
        '{ lines_per_mm: 1200, type: reflection }',
      ),
    );
    expect(r.lines[0]!.air_nm).toBeCloseTo(546.074, 8);
    expect(r.description.text).toContain('reflection');
  });

  it('default σ of an angle is one arcminute: σ_λ = d·cos θ·(π/10800)', () => {
    const r = reduced(session('  - angle_deg: 9.429\n'));
    const d = 1e6 / 300;
    const expected = d * Math.cos((9.429 * Math.PI) / 180) * (Math.PI / 180 / 60);
    // reduce reports σ in vacuum: undo the air→vacuum slope.
    expect(r.lines[0]!.sigma_nm / vacuumPerAirSlope(r.lines[0]!.air_nm) / expected).toBeCloseTo(1, 9);
    // The default is used, so it is said (once), not applied silently.
    expect(r.warnings.map((w) => [w.code, w.field])).toEqual([['assumed-sigma', 'measurement.sigma']]);
    expect(r.warnings[0]!.message).toContain('1′');
  });

  it('a spacing uncertainty adds λ·σ_d/d in quadrature', () => {
    const withSigma = reduced(
      session('  - angle_deg: 9.429\n    sigma: 0\n').replace(
        '{ lines_per_mm: 300 }',
        '{ lines_per_mm: 300, lines_per_mm_sigma: 3 }',
      ),
    );
    // σ_d/d = σ_N/N = 1 %, angle σ 0: σ_λ = 1 % of λ.
    expect(withSigma.lines[0]!.sigma_nm / withSigma.lines[0]!.vacuum_nm).toBeCloseTo(0.01, 4);
  });
});

describe('grating-angle bad input', () => {
  it('a reading on the wrong side of the order gives λ ≤ 0, named at its line', () => {
    const ds = failures(session('  - angle_deg: 9.429\n  - angle_deg: -9.429\n'));
    const d = ds.find((x) => x.code === 'order-sign');
    expect(d?.field).toBe('lines[1].angle_deg');
    expect(d?.line).toBe(9);
  });

  it('|sin β| > 1: a beam past grazing is a diagnostic naming the line', () => {
    const ds = failures(session('  - angle_deg: 60\n', '  incidence_deg: -40\n'));
    const d = ds.find((x) => x.code === 'no-diffraction');
    expect(d?.field).toBe('lines[0].angle_deg');
    expect(d?.line).toBeGreaterThan(1);
  });

  it('an angle of 90° or more is rejected with its position', () => {
    const ds = failures(session('  - angle_deg: 95\n'));
    const d = ds.find((x) => x.code === 'invalid-angle');
    expect(d?.field).toBe('lines[0].angle_deg');
    expect(d?.line).toBe(8);
  });

  it('order 0 and zero or negative spacings are rejected with positions', () => {
    expect(
      failures(session('  - angle_deg: 9.4\n    order: 0\n')).some(
        (d) => d.code === 'invalid-value' && d.field === 'lines[0].order' && d.line === 9,
      ),
    ).toBe(true);
    const zero = failures(session('  - angle_deg: 9.4\n').replace('lines_per_mm: 300', 'lines_per_mm: 0'));
    expect(zero.length).toBeGreaterThan(0);
    expect(zero[0]!.line).toBe(5);
    const negative = failures(
      session('  - angle_deg: 9.4\n').replace('{ lines_per_mm: 300 }', '{ spacing_um: -3.3 }'),
    );
    expect(negative[0]!.line).toBe(5);
  });

  it('the reducer guards a spacing of 0 even when handed a Session directly', () => {
    const s = sessionOf(session('  - angle_deg: 9.4\n'));
    const broken = {
      ...s,
      measurement: {
        ...s.measurement,
        grating: { spacing_nm: 0, spacing_sigma_nm: 0, type: 'transmission' as const },
      },
    };
    expectPositioned(reduceFailures(broken), 'invalid-value', 'measurement.grating');
  });
});
