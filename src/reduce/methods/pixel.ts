/**
 * Method `pixel`: line positions as pixel columns in a camera frame.
 *
 * With calibration lines (slit spectrograph, or any frame with a lamp of known lines) a
 * weighted least-squares polynomial λ(p) of degree 1–3 is fitted; without them, in slitless
 * mode (a grating in front of a camera), the zeroth-order image is the origin and either a
 * known dispersion or the camera geometry with the grating equation gives λ.
 */
import { DEG_PER_RAD } from '../../constants.js';
import type { Diagnostic } from '../../diagnostics.js';
import type { CalibrationPoint, RawLine, Session } from '../../session/types.js';
import { assumedSigmaWarning } from '../assumedSigma.js';
import { outOfOrderPoint } from '../fit/order.js';
import {
  evaluateDerivative,
  evaluatePolynomial,
  fitPolynomial,
  fittedVariance,
  type PolynomialFit,
} from '../fit/polynomial.js';
import { median, robustScatter } from '../fit/robust.js';
import {
  gratingSetupOf,
  lineDiagnostic,
  lineOrder,
  measurementDiagnostic,
  solveGratingEquation,
  unexplainedReading,
} from '../grating.js';
import type { CalibrationPointResult, CalibrationResult, MethodResult, ObservedReading } from '../types.js';
import { NM_PER_UNIT } from './wavelength.js';

/**
 * Used when neither the line, the calibration point nor measurement.sigma gives a pixel
 * uncertainty: a line centre read by eye off a profile is good to about half a pixel.
 */
export const DEFAULT_PIXEL_SIGMA_PX = 0.5;

/** A residual beyond this many robust standard deviations flags a calibration line. */
export const OUTLIER_THRESHOLD = 3;

/**
 * Floor of the robust scatter when flagging outliers, nm: an exact fit leaves residuals of
 * rounding size only, and those must not be called outliers.
 */
const SCATTER_FLOOR_NM = 1e-6;

type Calibration = NonNullable<Session['measurement']['calibration']>;

export function reducePixels(session: Session): MethodResult {
  const calibration = session.measurement.calibration;
  if (!calibration) {
    return {
      readings: [],
      calibration: null,
      description: { formula: 'λ(p)', text: 'No pixel calibration was given.' },
      diagnostics: [
        measurementDiagnostic(
          session,
          'measurement.calibration',
          'missing-key',
          'method pixel needs measurement.calibration',
          'add calibration lines of known wavelength, or zero_order_pixel with dispersion_nm_per_px',
        ),
      ],
    };
  }
  const slitless = calibration.zero_order_pixel;
  // The polynomial fit weights its calibration lines by their pixel σ; the slitless mode only checks them.
  const pointsWithout = slitless === null ? calibration.points.filter((p) => !(p.pixel_sigma > 0)).length : 0;
  const assumed = assumedSigmaWarning(
    session,
    `${DEFAULT_PIXEL_SIGMA_PX} px per pixel position`,
    pointsWithout,
  );
  const result =
    slitless !== null
      ? reduceSlitless(session, calibration, slitless)
      : reducePolynomial(session, calibration);
  return assumed ? { ...result, diagnostics: [assumed, ...result.diagnostics] } : result;
}

/** Pixel σ of a measured line: its own, else the session's, else the default. */
function readingSigmaPx(session: Session, line: RawLine): number {
  return line.sigma ?? session.measurement.sigma ?? DEFAULT_PIXEL_SIGMA_PX;
}

/** A calibration point's pixel σ; 0 is what the reader stores when none was written. */
function pointSigmaPx(session: Session, point: CalibrationPoint): number {
  return point.pixel_sigma > 0 ? point.pixel_sigma : (session.measurement.sigma ?? DEFAULT_PIXEL_SIGMA_PX);
}

function pointDiagnostic(
  session: Session,
  point: CalibrationPoint,
  i: number,
  code: string,
  message: string,
  hint: string,
  severity: Diagnostic['severity'],
): Diagnostic {
  return {
    file: session.file,
    line: point.position.line,
    col: point.position.col,
    severity,
    code,
    field: `measurement.calibration.lines[${i}]`,
    message,
    hint,
  };
}

/**
 * Effective-variance weighted fit: a point's wavelength σ is its pixel σ times the local slope
 * |dλ/dp|, which is only known after a fit, so fit unweighted first and refine twice.
 */
function fitCalibration(
  pixels: number[],
  wavelengths_nm: number[],
  pixelSigmas: number[],
  degree: number,
): PolynomialFit | null {
  let fit = fitPolynomial(
    pixels,
    wavelengths_nm,
    pixels.map(() => 1),
    degree,
  );
  for (let pass = 0; pass < 2 && fit; pass++) {
    const current = fit;
    const sigmas = pixels.map((p, i) =>
      Math.max(
        Math.abs(evaluateDerivative(current.coefficients, current.origin, p)) * pixelSigmas[i]!,
        1e-12,
      ),
    );
    fit = fitPolynomial(pixels, wavelengths_nm, sigmas, degree);
  }
  return fit;
}

/** Residuals with outlier flags (flagged, never dropped). */
function calibrationPoints(
  session: Session,
  fit: { value: (p: number) => number },
  points: CalibrationPoint[],
  diagnostics: Diagnostic[],
): { results: CalibrationPointResult[]; rms_nm: number } {
  const scale = NM_PER_UNIT[session.measurement.unit];
  const residuals = points.map((pt) => pt.wavelength * scale - fit.value(pt.pixel));
  const scatter = Math.max(robustScatter(residuals), SCATTER_FLOOR_NM);
  // Measured from the median residual: a least-squares fit pulled by one bad line shifts all
  // the good residuals together, and they must not be flagged for that.
  const centre = median(residuals);
  const results = points.map((pt, i): CalibrationPointResult => {
    const residual_nm = residuals[i]!;
    const outlier = Math.abs(residual_nm - centre) > OUTLIER_THRESHOLD * scatter;
    if (outlier) {
      diagnostics.push(
        pointDiagnostic(
          session,
          pt,
          i,
          'calibration-outlier',
          `residual ${residual_nm.toFixed(4)} nm is more than ${OUTLIER_THRESHOLD}× the robust scatter (${scatter.toExponential(2)} nm) of the calibration lines`,
          'check the pixel and the wavelength of this line; it is kept in the fit',
          'warning',
        ),
      );
    }
    return {
      pixel: pt.pixel,
      wavelength_nm: pt.wavelength * scale,
      fitted_nm: fit.value(pt.pixel),
      residual_nm,
      outlier,
      label: pt.label,
    };
  });
  const rms_nm =
    residuals.length > 0 ? Math.sqrt(residuals.reduce((a, r) => a + r * r, 0) / residuals.length) : 0;
  return { results, rms_nm };
}

/** Where dλ/dp = 0 strictly inside (lo, hi): the fit turns over there. Degree ≤ 3 → a quadratic. */
function turningPixels(coefficients: readonly number[], origin: number, lo: number, hi: number): number[] {
  const b = coefficients[1] ?? 0;
  const c = 2 * (coefficients[2] ?? 0);
  const d = 3 * (coefficients[3] ?? 0);
  // dλ/du = b + c·u + d·u², u = p − origin.
  let roots: number[];
  if (d === 0) roots = c === 0 ? [] : [-b / c];
  else {
    const disc = c * c - 4 * d * b;
    if (disc < 0) roots = [];
    else {
      // The numerically stable pair of quadratic roots.
      const q = -0.5 * (c + Math.sign(c || 1) * Math.sqrt(disc));
      roots = [q / d, q !== 0 ? b / q : Number.NaN];
    }
  }
  return roots.map((u) => u + origin).filter((p) => Number.isFinite(p) && p > lo && p < hi);
}

/**
 * The fit turns over: say where, at the line that causes it. A calibration line out of order
 * with the others is the usual cause; with the calibration lines in order, a measured line
 * beyond the turn (outside the calibration lines) is; otherwise the calibration line nearest
 * the turn.
 */
function nonMonotonic(
  session: Session,
  points: readonly CalibrationPoint[],
  turns: readonly number[],
  degree: number,
  lo: number,
  hi: number,
): Diagnostic {
  const unit =
    session.measurement.unit === 'angstrom' ? 'Å' : session.measurement.unit === 'um' ? 'µm' : 'nm';
  const head = `the degree-${degree} fit turns over at pixel ${turns.map((t) => t.toFixed(1)).join(', ')}, inside the used range ${lo}–${hi}: one wavelength would sit at two pixels`;
  const pixels = points.map((p) => p.pixel);
  const culprit = outOfOrderPoint(
    pixels,
    points.map((p) => p.wavelength),
  );
  if (culprit !== null) {
    const p = points[culprit]!;
    return pointDiagnostic(
      session,
      p,
      culprit,
      'non-monotonic-fit',
      `${head}; this calibration line (pixel ${p.pixel}, ${p.wavelength} ${unit}) is out of order with the others`,
      'check its pixel and its wavelength (a mislabelled line?), or lower the degree',
      'error',
    );
  }
  const calLo = Math.min(...pixels);
  const calHi = Math.max(...pixels);
  const beyond = session.lines.find(
    (l) =>
      l.pixel !== null &&
      (l.pixel < calLo || l.pixel > calHi) &&
      turns.some((t) => (l.pixel! > calHi ? t >= calHi && t < l.pixel! : t <= calLo && t > l.pixel!)),
  );
  if (beyond)
    return lineDiagnostic(
      session,
      beyond,
      'pixel',
      'non-monotonic-fit',
      `${head}; this line (pixel ${beyond.pixel}) lies beyond the turn, outside the calibration lines (${calLo}–${calHi})`,
      'add a calibration line near this pixel, or lower the degree',
    );
  const turn = turns[0]!;
  const nearest = pixels.reduce(
    (best, px, i) => (Math.abs(px - turn) < Math.abs(pixels[best]! - turn) ? i : best),
    0,
  );
  return pointDiagnostic(
    session,
    points[nearest]!,
    nearest,
    'non-monotonic-fit',
    `${head}; the calibration lines are in order, and this one is nearest the turn`,
    'lower the degree, or add calibration lines around this pixel',
    'error',
  );
}

function reducePolynomial(session: Session, calibration: Calibration): MethodResult {
  const diagnostics: Diagnostic[] = [];
  const degree = calibration.degree;
  const points = calibration.points;
  const scale = NM_PER_UNIT[session.measurement.unit];
  const description = {
    formula: `λ(p) = Σᵢ cᵢ (p − p₀)ⁱ, i = 0…${degree}`,
    text: `A weighted least-squares polynomial of degree ${degree} was fitted to ${points.length} calibration lines of known wavelength.`,
  };
  const fail = (): MethodResult => ({ readings: [], calibration: null, description, diagnostics });
  const first = points[0];
  const atCalibration = (code: string, message: string, hint: string) =>
    first
      ? pointDiagnostic(session, first, 0, code, message, hint, 'error')
      : measurementDiagnostic(session, 'measurement.calibration', code, message, hint);

  if (!Number.isInteger(degree) || degree < 1 || degree > 3) {
    diagnostics.push(
      atCalibration('invalid-value', `degree ${degree} is not supported`, 'use degree 1, 2 or 3'),
    );
    return fail();
  }
  // Guard kept here too (the reader checks it): degree + 2 points leave at least one degree of freedom.
  if (points.length < degree + 2) {
    diagnostics.push(
      atCalibration(
        'too-few-calibration-lines',
        `a degree-${degree} fit needs at least ${degree + 2} calibration lines; ${points.length} given`,
        'add calibration lines or lower the degree',
      ),
    );
    return fail();
  }
  if (new Set(points.map((p) => p.pixel)).size < degree + 1) {
    diagnostics.push(
      atCalibration(
        'degenerate-calibration',
        `the calibration lines sit at fewer than ${degree + 1} distinct pixels`,
        'use calibration lines spread across the frame',
      ),
    );
    return fail();
  }
  const pixels = points.map((p) => p.pixel);
  const fit = fitCalibration(
    pixels,
    points.map((p) => p.wavelength * scale),
    points.map((p) => pointSigmaPx(session, p)),
    degree,
  );
  if (!fit) {
    diagnostics.push(
      atCalibration(
        'degenerate-calibration',
        'the calibration lines do not determine the polynomial',
        'use more calibration lines, spread across the frame',
      ),
    );
    return fail();
  }
  const value = (p: number) => evaluatePolynomial(fit.coefficients, fit.origin, p);
  const { results, rms_nm } = calibrationPoints(session, { value }, points, diagnostics);

  const measured = session.lines.flatMap((l) => (l.pixel === null ? [] : [l.pixel]));
  const lo = Math.min(...pixels, ...measured);
  const hi = Math.max(...pixels, ...measured);
  const turns = turningPixels(fit.coefficients, fit.origin, lo, hi);
  if (turns.length > 0) diagnostics.push(nonMonotonic(session, points, turns, degree, lo, hi));
  const calLo = Math.min(...pixels);
  const calHi = Math.max(...pixels);
  const readings: ObservedReading[] = [];
  for (const line of session.lines) {
    if (line.pixel === null) {
      diagnostics.push(
        lineDiagnostic(session, line, '', 'missing-key', 'this line has no pixel position', 'add pixel:'),
      );
      continue;
    }
    const order = lineOrder(session, line, diagnostics);
    if (order === null) continue;
    const p = line.pixel;
    const sigmaPx = readingSigmaPx(session, line);
    // The calibration holds m·λ fixed at each pixel (grating equation): a line read in another
    // order than the calibration's sits at λ·m_cal/m.
    const factor = session.measurement.order / order;
    const wavelength_nm = value(p) * factor;
    const slope = evaluateDerivative(fit.coefficients, fit.origin, p);
    // σ² = (dλ/dp · σ_p)² + gᵀ C g: the reading and the fit, independent of each other.
    const sigma_nm = Math.abs(factor) * Math.sqrt((slope * sigmaPx) ** 2 + fittedVariance(fit, p));
    if (!(wavelength_nm > 0)) {
      diagnostics.push(
        lineDiagnostic(
          session,
          line,
          'pixel',
          'non-positive',
          `pixel ${p} maps to λ = ${wavelength_nm.toFixed(3)} nm`,
          'check the pixel, the order and the calibration',
        ),
      );
      continue;
    }
    if (p < calLo || p > calHi) {
      diagnostics.push(
        lineDiagnostic(
          session,
          line,
          'pixel',
          'extrapolated',
          `pixel ${p} lies outside the calibration lines (${calLo}–${calHi}); the fit is extrapolated`,
          'add a calibration line beyond it',
          'warning',
        ),
      );
    }
    readings.push({
      index: line.index,
      wavelength_nm,
      sigma_nm,
      reading_text: `p = ${p} px${order !== session.measurement.order ? `, m = ${order}` : ''}`,
    });
  }
  if (diagnostics.some((d) => d.severity === 'error')) return fail();

  const result: CalibrationResult = {
    kind: 'polynomial',
    coefficients: fit.coefficients,
    pixel_origin: fit.origin,
    covariance: fit.covariance,
    degree,
    rms_nm,
    points: results,
    pixel_range: [lo, hi],
    description:
      `Weighted least squares, degree ${degree}, ${points.length} lines, centred at p₀ = ${fit.origin.toFixed(2)} px; ` +
      `weights from each line's pixel σ times the local dispersion; χ²/dof = ${fit.dof > 0 ? (fit.chi2 / fit.dof).toFixed(2) : 'n/a'}` +
      `${fit.covariance_scale > 1 ? ' (covariance scaled by it)' : ''}; RMS ${rms_nm.toFixed(4)} nm.`,
  };
  return { readings, calibration: result, description, diagnostics };
}

function reduceSlitless(session: Session, calibration: Calibration, zero_px: number): MethodResult {
  const diagnostics: Diagnostic[] = [];
  const dispersion = calibration.dispersion_nm_per_px;
  const pixelSize_um = calibration.pixel_size_um;
  const sensor_mm = calibration.sensor_distance_mm;
  const geometry = dispersion === null ? gratingSetupOf(session) : null;
  if (geometry) diagnostics.push(...geometry.diagnostics);
  if (dispersion !== null && !(dispersion > 0)) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.calibration.dispersion_nm_per_px',
        'invalid-value',
        'the dispersion must be positive',
        'give nm per pixel in first order',
      ),
    );
  }
  if (
    dispersion === null &&
    !(pixelSize_um !== null && pixelSize_um > 0 && sensor_mm !== null && sensor_mm > 0)
  ) {
    diagnostics.push(
      measurementDiagnostic(
        session,
        'measurement.calibration',
        'missing-key',
        'slitless mode needs dispersion_nm_per_px, or positive pixel_size_um and sensor_distance_mm',
        'add the dispersion, or the pixel size and the grating-to-sensor distance',
      ),
    );
  }
  const description =
    dispersion !== null
      ? {
          formula: 'λ = D·|p − p₀| / |m|',
          text: `Slitless: wavelengths from the distance to the zeroth-order image (p₀ = ${zero_px} px) and a first-order dispersion of ${dispersion} nm/px.`,
        }
      : {
          formula: 'θ = atan(|p − p₀|·s / L);  m·λ = d·(sin α + sin β)',
          text: `Slitless: the angle of each line follows from its distance to the zeroth-order image (p₀ = ${zero_px} px), the pixel size s = ${pixelSize_um} µm and the grating-to-sensor distance L = ${sensor_mm} mm; then the grating equation.`,
        };
  if (diagnostics.some((d) => d.severity === 'error'))
    return { readings: [], calibration: null, description, diagnostics };

  /** λ and σ of one pixel position, or the reason it has none. */
  const solve = (
    p: number,
    sigmaPx: number,
    order: number,
  ):
    | { wavelength_nm: number; sigma_nm: number }
    | { failure: Parameters<typeof unexplainedReading>[5]; theta_deg: number } => {
    const distance_px = Math.abs(p - zero_px);
    if (dispersion !== null) {
      const wavelength_nm = (dispersion * distance_px) / Math.abs(order);
      if (!(wavelength_nm > 0))
        return { failure: { ok: false, reason: 'non-positive', beta_deg: 0, wavelength_nm }, theta_deg: 0 };
      // The zeroth-order position and D are taken as exact (no keys give their σ).
      return { wavelength_nm, sigma_nm: (dispersion * sigmaPx) / Math.abs(order) };
    }
    const s_mm = (pixelSize_um ?? 0) / 1000;
    const L = sensor_mm ?? 0;
    const x = distance_px * s_mm;
    const theta_deg = Math.atan2(x, L) * DEG_PER_RAD;
    const sigmaTheta_deg = ((L * s_mm * sigmaPx) / (x * x + L * L)) * DEG_PER_RAD;
    const setup = { ...geometry!.setup!, order: Math.abs(order) };
    const solution = solveGratingEquation(setup, theta_deg, sigmaTheta_deg);
    return solution.ok ? solution : { failure: solution, theta_deg };
  };

  const readings: ObservedReading[] = [];
  for (const line of session.lines) {
    if (line.pixel === null) {
      diagnostics.push(
        lineDiagnostic(session, line, '', 'missing-key', 'this line has no pixel position', 'add pixel:'),
      );
      continue;
    }
    const order = lineOrder(session, line, diagnostics);
    if (order === null) continue;
    const r = solve(line.pixel, readingSigmaPx(session, line), order);
    if ('failure' in r) {
      const setup = geometry?.setup ?? { spacing_nm: 0, spacing_sigma_nm: 0, order, incidence_deg: 0 };
      diagnostics.push(
        r.failure.wavelength_nm === 0
          ? lineDiagnostic(
              session,
              line,
              'pixel',
              'on-zero-order',
              `pixel ${line.pixel} is the zeroth-order image itself`,
              'check the pixel and calibration.zero_order_pixel',
            )
          : unexplainedReading(
              session,
              line,
              'pixel',
              { ...setup, order: Math.abs(order) },
              r.theta_deg,
              r.failure,
            ),
      );
      continue;
    }
    readings.push({
      index: line.index,
      wavelength_nm: r.wavelength_nm,
      sigma_nm: r.sigma_nm,
      reading_text: `p = ${line.pixel} px (p − p₀ = ${(line.pixel - zero_px).toFixed(1)}), m = ${Math.abs(order)}`,
    });
  }
  if (diagnostics.some((d) => d.severity === 'error'))
    return { readings: [], calibration: null, description, diagnostics };

  // Calibration lines, when given, check the slitless model: their residuals go on the record.
  const value = (p: number) => {
    const r = solve(p, 0, session.measurement.order);
    return 'failure' in r ? Number.NaN : r.wavelength_nm;
  };
  const { results, rms_nm } = calibrationPoints(session, { value }, calibration.points, diagnostics);
  const measured = session.lines.flatMap((l) => (l.pixel === null ? [] : [l.pixel]));
  const all = [...measured, ...calibration.points.map((p) => p.pixel), zero_px];
  const result: CalibrationResult = {
    kind: 'slitless',
    // Linear mode: λ = c₁·|p − p₀| in first order; geometry mode has no polynomial form.
    coefficients: dispersion !== null ? [0, dispersion] : [],
    pixel_origin: zero_px,
    covariance:
      dispersion !== null
        ? [
            [0, 0],
            [0, 0],
          ]
        : [],
    degree: dispersion !== null ? 1 : 0,
    rms_nm,
    points: results,
    pixel_range: [Math.min(...all), Math.max(...all)],
    description: `${description.text}${results.length > 0 ? ` Checked against ${results.length} calibration lines: RMS ${rms_nm.toFixed(4)} nm.` : ' No calibration lines were given to check it.'}`,
  };
  return { readings, calibration: result, description, diagnostics };
}
