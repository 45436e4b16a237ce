import { describe, expect, it } from 'vitest';
import { vacuumPerAirSlope } from '../../src/reduce/airVacuum.js';
import { reduceSession } from '../../src/reduce/reduce.js';
import type { Session } from '../../src/session/types.js';
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

/** A known dispersion law in raw pixels (not centred), monotonic over 0…2000 px. */
const LAWS: Record<1 | 2 | 3, number[]> = {
  1: [380, 0.2],
  2: [380, 0.21, -8e-6],
  3: [380, 0.21, -1.2e-5, 2.5e-9],
};
const law = (coeffs: number[], p: number) => coeffs.reduce((acc, c, i) => acc + c * p ** i, 0);

function pixelSession(
  points: { pixel: number; wavelength: number }[],
  lines: number[],
  degree: number,
  extra = '',
): string {
  const cal = points.map((p) => `      - { pixel: ${p.pixel}, wavelength: ${p.wavelength} }`).join('\n');
  const measured = lines.map((p) => `  - pixel: ${p}`).join('\n');
  return `lineledger: 1
medium: vacuum
measurement:
  method: pixel
${extra}  calibration:
    degree: ${degree}
    lines:
${cal}
lines:
${measured}
`;
}

describe('pixel calibration: exact recovery of a known polynomial', () => {
  for (const degree of [1, 2, 3] as const) {
    it(`degree ${degree}`, () => {
      const coeffs = LAWS[degree];
      const pixels = [60, 310, 580, 870, 1130, 1420, 1690, 1950];
      const points = pixels.map((pixel) => ({ pixel, wavelength: law(coeffs, pixel) }));
      const probes = [200, 999.5, 1800];
      const r = reduced(pixelSession(points, probes, degree));
      probes.forEach((p, i) => {
        expect(r.lines[i]!.vacuum_nm).toBeCloseTo(law(coeffs, p), 8);
      });
      const cal = r.calibration!;
      expect(cal.kind).toBe('polynomial');
      expect(cal.rms_nm).toBeLessThan(1e-9);
      expect(cal.points.every((pt) => !pt.outlier)).toBe(true);
      // The reported coefficients are the Taylor coefficients of the law about p₀: P⁽ⁱ⁾(p₀)/i!.
      const p0 = cal.pixel_origin;
      const taylor = [0, 1, 2, 3].slice(0, degree + 1).map((i) => {
        let sum = 0;
        coeffs.forEach((c, k) => {
          if (k < i) return;
          let falling = 1;
          for (let j = 0; j < i; j++) falling *= k - j;
          let fact = 1;
          for (let j = 2; j <= i; j++) fact *= j;
          sum += (c * falling * p0 ** (k - i)) / fact;
        });
        return sum;
      });
      cal.coefficients.forEach((c, i) => {
        expect(c).toBeCloseTo(taylor[i]!, 12 - 3 * i);
      });
    });
  }

  it('calibration wavelengths in ångström are converted to nm', () => {
    const coeffs = LAWS[1];
    const points = [100, 700, 1300, 1900].map((pixel) => ({ pixel, wavelength: law(coeffs, pixel) * 10 }));
    const r = reduced(pixelSession(points, [1000], 1, '  unit: angstrom\n'));
    expect(r.lines[0]!.vacuum_nm).toBeCloseTo(law(coeffs, 1000), 8);
  });

  it('a line read in second order against a first-order calibration is at λ/2', () => {
    const coeffs = LAWS[1];
    const points = [100, 700, 1300, 1900].map((pixel) => ({ pixel, wavelength: law(coeffs, pixel) }));
    const text = pixelSession(points, [1000], 1).replace('  - pixel: 1000', '  - pixel: 1000\n    order: 2');
    expect(reduced(text).lines[0]!.vacuum_nm).toBeCloseTo(law(coeffs, 1000) / 2, 8);
  });
});

describe('pixel calibration: uncertainty', () => {
  it('σ (reading + fit covariance) matches a Monte-Carlo spread within 10 %', () => {
    const coeffs = LAWS[2];
    const pixels = [80, 350, 610, 900, 1150, 1400, 1700, 1930];
    const sigmaCal = 0.4;
    const sigmaLine = 0.7;
    const probe = 1990; // near the edge, where the fit covariance matters most
    const points = pixels.map((pixel) => ({ pixel, wavelength: law(coeffs, pixel) }));
    const text = pixelSession(points, [probe], 2, `  sigma: ${sigmaLine}\n`).replace(
      / \}/g,
      `, pixel_sigma: ${sigmaCal} }`,
    );
    const base = sessionOf(text);
    const reported = reduced(text).lines[0]!.sigma_nm;

    const normal = gaussian(mulberry32(7));
    const samples: number[] = [];
    for (let trial = 0; trial < 3000; trial++) {
      const cal = base.measurement.calibration!;
      const perturbed: Session = {
        ...base,
        measurement: {
          ...base.measurement,
          calibration: {
            ...cal,
            points: cal.points.map((pt) => ({ ...pt, pixel: pt.pixel + sigmaCal * normal() })),
          },
        },
        lines: base.lines.map((l) => ({ ...l, pixel: (l.pixel as number) + sigmaLine * normal() })),
      };
      const out = reduceSession(perturbed);
      if (!out.ok) throw new Error('a perturbed calibration failed');
      samples.push(out.value.lines[0]!.vacuum_nm);
    }
    // The reading alone would give |dλ/dp|·σ_line; the fit term must be visible in the total.
    const slope = coeffs[1]! + 2 * coeffs[2]! * probe;
    expect(reported).toBeGreaterThan(1.02 * Math.abs(slope) * sigmaLine);
    expect(Math.abs(reported / standardDeviation(samples) - 1)).toBeLessThan(0.1);
  });

  it('the covariance is scaled up by χ²/dof when the scatter exceeds the stated σ', () => {
    const coeffs = LAWS[1];
    const wobble = [0.3, -0.25, 0.2, -0.3, 0.28, -0.22];
    const points = [100, 400, 700, 1000, 1300, 1600].map((pixel, i) => ({
      pixel,
      wavelength: law(coeffs, pixel) + wobble[i]!,
    }));
    const text = pixelSession(points, [900], 1, '  sigma: 0.01\n');
    const r = reduced(text);
    expect(r.calibration!.description).toContain('scaled');
    // With σ_p = 0.01 px the stated σ_λ is 0.002 nm; the scatter is ~0.3 nm: the reported σ follows the scatter.
    expect(r.lines[0]!.sigma_nm).toBeGreaterThan(0.05);
  });
});

describe('pixel calibration: bad and doubtful input', () => {
  it('an outlier is flagged, kept, and warned about', () => {
    const coeffs = LAWS[1];
    const pixels = [100, 400, 700, 1000, 1300, 1600, 1900];
    const points = pixels.map((pixel, i) => ({
      pixel,
      wavelength: law(coeffs, pixel) + (i === 3 ? 5 : 0.01 * ((i % 3) - 1)),
    }));
    const r = reduced(pixelSession(points, [800], 1));
    const cal = r.calibration!;
    expect(cal.points).toHaveLength(7);
    expect(cal.points.filter((p) => p.outlier).map((p) => p.pixel)).toEqual([1000]);
    const w = r.warnings.find((d) => d.code === 'calibration-outlier');
    expect(w?.field).toBe('measurement.calibration.lines[3]');
    expect(w?.line).toBe(11);
  });

  it('too few calibration lines is a diagnostic at the calibration', () => {
    const points = [100, 900].map((pixel) => ({ pixel, wavelength: law(LAWS[1], pixel) }));
    expectPositioned(failures(pixelSession(points, [500], 1)), 'too-few-calibration-lines');
    // The reducer keeps its own guard for Sessions built in code.
    const ok = sessionOf(
      pixelSession(
        [100, 500, 900].map((pixel) => ({ pixel, wavelength: law(LAWS[1], pixel) })),
        [500],
        1,
      ),
    );
    const cal = ok.measurement.calibration!;
    const broken: Session = { ...ok, measurement: { ...ok.measurement, calibration: { ...cal, degree: 2 } } };
    expectPositioned(reduceFailures(broken), 'too-few-calibration-lines', 'measurement.calibration.lines[0]');
  });

  it('a fit that turns over inside the used pixel range is an error', () => {
    const points = [
      { pixel: 100, wavelength: 500 },
      { pixel: 300, wavelength: 600 },
      { pixel: 500, wavelength: 650 },
      { pixel: 700, wavelength: 660 },
      { pixel: 900, wavelength: 640 },
    ];
    // Points at the line that breaks the order (660 → 640 nm), not at the first one.
    const d = expectPositioned(
      failures(pixelSession(points, [400], 2)),
      'non-monotonic-fit',
      'measurement.calibration.lines[4]',
    );
    expect(d.line).toBe(12);
    expect(d.message).toContain('pixel 900, 640 nm');
  });

  it('a mislabelled calibration line in the middle is the one named', () => {
    // A straight law (common practice for a small grating spectrometer) with the line at
    // pixel 400 given the wavelength of the line at 800: out of order with both neighbours.
    const lam = (p: number) => 400 + 0.3 * p;
    const pixels = [100, 200, 300, 400, 500, 600, 700, 800];
    const points = pixels.map((pixel) => ({ pixel, wavelength: lam(pixel === 400 ? 800 : pixel) }));
    const d = expectPositioned(
      failures(pixelSession(points, [450], 3)),
      'non-monotonic-fit',
      'measurement.calibration.lines[3]',
    );
    expect(d.line).toBe(11);
    expect(d.message).toContain('pixel 400, 640 nm');
  });

  it('a measured pixel beyond the turning point also counts (the range includes the lines)', () => {
    // Monotonic over the calibration lines (100…500), turning over near 750 px.
    const q = (p: number) => 400 + 0.6 * p - 0.0004 * p * p;
    const points = [100, 200, 300, 400, 500].map((pixel) => ({ pixel, wavelength: q(pixel) }));
    expect(reduced(pixelSession(points, [450], 2)).lines[0]!.vacuum_nm).toBeCloseTo(q(450), 6);
    // The calibration lines are in order: the measured line past the turn is the one named.
    const d = expectPositioned(
      failures(pixelSession(points, [450, 900], 2)),
      'non-monotonic-fit',
      'lines[1].pixel',
    );
    expect(d.line).toBe(15);
  });

  it('extrapolation beyond the calibration lines is a warning', () => {
    const points = [300, 600, 900, 1200].map((pixel) => ({ pixel, wavelength: law(LAWS[1], pixel) }));
    expect(
      reduced(pixelSession(points, [1500], 1)).warnings.some(
        (w) => w.code === 'extrapolated' && w.field === 'lines[0].pixel',
      ),
    ).toBe(true);
  });
});

describe('slitless pixel mode', () => {
  const slitless = (calibration: string, lines: string, extra = '') => `lineledger: 1
measurement:
  method: pixel
${extra}  calibration:
${calibration}
lines:
${lines}`;

  it('linear dispersion from the zeroth order: λ = D·|p − p₀|', () => {
    const r = reduced(
      slitless(
        '    zero_order_pixel: 210\n    dispersion_nm_per_px: 0.85',
        '  - pixel: 852.5\n    sigma: 1\n',
      ),
    );
    const air = 0.85 * (852.5 - 210);
    expect(r.lines[0]!.air_nm).toBeCloseTo(air, 9);
    expect(r.lines[0]!.sigma_nm / vacuumPerAirSlope(air)).toBeCloseTo(0.85, 9);
    expect(r.calibration?.kind).toBe('slitless');
    expect(r.calibration?.pixel_origin).toBe(210);
  });

  it('camera geometry with the grating equation: θ = atan(|p − p₀|·s / L)', () => {
    // 100 lines/mm, 3.75 µm pixels, 50 mm from grating to sensor; 656.28 nm (air) in first order:
    // θ = asin(λ/d), |p − p₀| = L·tan θ / s.
    const d = 1e4;
    const theta = Math.asin(656.28 / d);
    const dp = (50 * Math.tan(theta)) / 3.75e-3;
    const r = reduced(
      slitless(
        '    zero_order_pixel: 100\n    pixel_size_um: 3.75\n    sensor_distance_mm: 50',
        `  - pixel: ${100 + dp}\n`,
        '  grating: { lines_per_mm: 100 }\n',
      ),
    );
    expect(r.lines[0]!.air_nm).toBeCloseTo(656.28, 8);
  });

  it('a line on the zeroth-order image is a diagnostic at its line', () => {
    const d = failures(
      slitless('    zero_order_pixel: 210\n    dispersion_nm_per_px: 0.85', '  - pixel: 210\n'),
    );
    expect(d.some((x) => x.code === 'on-zero-order' && x.field === 'lines[0].pixel' && x.line === 8)).toBe(
      true,
    );
  });

  it('calibration lines given in slitless mode are checked and their residuals reported', () => {
    const r = reduced(
      slitless(
        '    zero_order_pixel: 0\n    dispersion_nm_per_px: 1\n    lines:\n      - { pixel: 500, wavelength: 500.5 }\n      - { pixel: 600, wavelength: 599.5 }',
        '  - pixel: 550\n',
      ),
    );
    expect(r.calibration!.points.map((p) => p.residual_nm)).toEqual([
      expect.closeTo(0.5, 9),
      expect.closeTo(-0.5, 9),
    ]);
    expect(r.calibration!.rms_nm).toBeCloseTo(0.5, 9);
  });
});
