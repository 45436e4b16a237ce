/** Vega-Lite specs for the record's charts. Pure data → spec; rendering is elsewhere. */
import type { TopLevelSpec } from 'vega-lite';
import { SPECIES_PALETTE, wavelengthToHex } from '../colour.js';

const FONT = 'DejaVu Sans, Liberation Sans, Arial, sans-serif';
const CONFIG = {
  // Per-mark ARIA off: the whole chart is one image with a text alternative (set in render.ts),
  // and the same numbers stand in a table beside it.
  aria: false,
  font: FONT,
  view: { stroke: null },
  axis: { labelFontSize: 11, titleFontSize: 12, grid: false },
  legend: { labelFontSize: 11, titleFontSize: 12, orient: 'bottom' as const },
  background: 'white',
};

export interface SpectrumChartInput {
  title: string;
  unitLabel: string;
  range_nm: [number, number];
  /** Emission lines rise from the axis; absorption lines hang down from a continuum at the top. */
  measured: { wavelength_nm: number; height: number; label: string; absorption: boolean }[];
  references: { wavelength_nm: number; height: number; species: string }[];
  species: string[];
}

/** Height of the drawn continuum from which absorption lines dip. */
const CONTINUUM = 1.02;

/** Measured lines (black, above the axis) against the explanation's reference lines (below, by species). */
export function spectrumChart(input: SpectrumChartInput): TopLevelSpec {
  const [lo, hi] = input.range_nm;
  const band: { from: number; to: number; colour: string }[] = [];
  const step = Math.max(0.5, (hi - lo) / 300);
  for (let x = lo; x < hi; x += step)
    band.push({ from: x, to: Math.min(hi, x + step), colour: wavelengthToHex(x + step / 2) });
  const x = {
    field: 'wavelength_nm',
    type: 'quantitative' as const,
    scale: { domain: [lo, hi], nice: false, zero: false },
    title: `Wavelength (${input.unitLabel})`,
  };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: input.title,
    config: CONFIG,
    vconcat: [
      {
        width: 640,
        height: 14,
        data: { values: band },
        mark: { type: 'rect' },
        encoding: {
          x: {
            field: 'from',
            type: 'quantitative',
            scale: { domain: [lo, hi], nice: false, zero: false },
            axis: null,
          },
          x2: { field: 'to' },
          color: { field: 'colour', type: 'nominal', scale: null, legend: null },
        },
      },
      {
        width: 640,
        height: 200,
        layer: [
          {
            data: {
              values: input.measured.map((m) =>
                m.absorption
                  ? { ...m, base: CONTINUUM, height: CONTINUUM - 0.9 * m.height }
                  : { ...m, base: 0 },
              ),
            },
            mark: { type: 'rule', color: '#000000', strokeWidth: 2 },
            encoding: {
              x,
              y: { field: 'base', type: 'quantitative', scale: { domain: [-1.05, 1.05] }, axis: null },
              y2: { field: 'height' },
              tooltip: [{ field: 'label', type: 'nominal' }],
            },
          },
          {
            data: { values: input.references.map((r) => ({ ...r, base: 0 })) },
            mark: { type: 'rule', strokeWidth: 1.5, strokeDash: [4, 2] },
            encoding: {
              x,
              y: { field: 'base', type: 'quantitative' },
              y2: { field: 'height' },
              color: {
                field: 'species',
                type: 'nominal',
                title: 'Reference (below axis)',
                scale: {
                  domain: input.species,
                  range: [...SPECIES_PALETTE].slice(0, Math.max(1, input.species.length)),
                },
              },
            },
          },
          {
            data: { values: [{}] },
            mark: { type: 'rule', color: '#555555' },
            encoding: { y: { datum: 0, type: 'quantitative' } },
          },
          ...(input.measured.some((m) => m.absorption)
            ? [
                {
                  data: { values: [{}] },
                  mark: { type: 'rule' as const, color: '#999999', strokeWidth: 3 },
                  encoding: { y: { datum: CONTINUUM, type: 'quantitative' as const } },
                },
              ]
            : []),
        ],
      },
    ],
  } as TopLevelSpec;
}

export interface ResidualPoint {
  wavelength_nm: number;
  residual_nm: number;
  sigma_nm: number;
  species: string;
}

/** Residual (measured − reference) against wavelength, with ±σ bars. */
export function residualChart(
  title: string,
  unitLabel: string,
  points: ResidualPoint[],
  species: string[],
): TopLevelSpec {
  const rows = points.map((p) => ({
    ...p,
    low: p.residual_nm - p.sigma_nm,
    high: p.residual_nm + p.sigma_nm,
  }));
  const colour = {
    field: 'species',
    type: 'nominal' as const,
    title: 'Species',
    scale: { domain: species, range: [...SPECIES_PALETTE].slice(0, Math.max(1, species.length)) },
  };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: title,
    config: CONFIG,
    width: 640,
    height: 180,
    data: { values: rows },
    layer: [
      { mark: { type: 'rule', color: '#888888' }, encoding: { y: { datum: 0, type: 'quantitative' } } },
      {
        mark: { type: 'rule', strokeWidth: 1.5 },
        encoding: {
          x: {
            field: 'wavelength_nm',
            type: 'quantitative',
            scale: { zero: false },
            title: `Wavelength (${unitLabel})`,
          },
          y: { field: 'low', type: 'quantitative', title: 'Residual (nm)' },
          y2: { field: 'high' },
          color: colour,
        },
      },
      {
        mark: { type: 'point', filled: true, size: 50 },
        encoding: {
          x: { field: 'wavelength_nm', type: 'quantitative' },
          y: { field: 'residual_nm', type: 'quantitative' },
          color: colour,
          shape: { field: 'species', type: 'nominal', legend: null },
        },
      },
    ],
  } as TopLevelSpec;
}

/** Candidate scores (log-likelihood ratio, nats), best first. */
export function scoreChart(
  title: string,
  rows: { species: string; score: number; chosen: boolean }[],
): TopLevelSpec {
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: title,
    config: CONFIG,
    width: 480,
    height: { step: 20 },
    data: { values: rows.map((r) => ({ ...r, role: r.chosen ? 'in the result' : 'not needed' })) },
    mark: { type: 'bar' },
    encoding: {
      y: { field: 'species', type: 'nominal', sort: null, title: null },
      x: { field: 'score', type: 'quantitative', title: 'Evidence score (natural log of the odds ratio)' },
      color: {
        field: 'role',
        type: 'nominal',
        title: null,
        scale: { domain: ['in the result', 'not needed'], range: ['#0072B2', '#BBBBBB'] },
      },
    },
  } as TopLevelSpec;
}

/** Pixel calibration: points and fitted curve, then residuals. */
export function calibrationChart(
  title: string,
  points: { pixel: number; wavelength_nm: number; residual_nm: number; outlier: boolean }[],
  curve: { pixel: number; wavelength_nm: number }[],
): TopLevelSpec {
  const x = { field: 'pixel', type: 'quantitative' as const, scale: { zero: false }, title: 'Pixel' };
  const rows = points.map((p) => ({ ...p, status: p.outlier ? 'flagged outlier' : 'calibration line' }));
  const status = {
    field: 'status',
    type: 'nominal' as const,
    title: null,
    scale: { domain: ['calibration line', 'flagged outlier'], range: ['#0072B2', '#D55E00'] },
  };
  const shape = {
    field: 'status',
    type: 'nominal' as const,
    title: null,
    scale: { domain: ['calibration line', 'flagged outlier'], range: ['circle', 'diamond'] },
  };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: title,
    config: CONFIG,
    vconcat: [
      {
        width: 640,
        height: 180,
        layer: [
          {
            data: { values: curve },
            mark: { type: 'line', color: '#555555' },
            encoding: {
              x,
              y: {
                field: 'wavelength_nm',
                type: 'quantitative',
                scale: { zero: false },
                title: 'Wavelength (nm)',
              },
            },
          },
          {
            data: { values: rows },
            mark: { type: 'point', filled: true, size: 60 },
            encoding: {
              x,
              y: { field: 'wavelength_nm', type: 'quantitative' },
              color: status,
              shape,
            },
          },
        ],
      },
      {
        width: 640,
        height: 120,
        data: { values: rows },
        layer: [
          { mark: { type: 'rule', color: '#888888' }, encoding: { y: { datum: 0, type: 'quantitative' } } },
          {
            mark: { type: 'point', filled: true, size: 60 },
            encoding: {
              x,
              y: { field: 'residual_nm', type: 'quantitative', title: 'Residual (nm)' },
              color: status,
              shape,
            },
          },
        ],
      },
    ],
  } as TopLevelSpec;
}

/** Archive overview: which species were found in which run. */
export function overviewChart(title: string, rows: { session: string; species: string }[]): TopLevelSpec {
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: title,
    config: CONFIG,
    width: { step: 28 },
    height: { step: 20 },
    data: { values: rows },
    mark: { type: 'square', size: 160, color: '#0072B2' },
    encoding: {
      x: { field: 'session', type: 'nominal', title: 'Session', axis: { labelAngle: -40 } },
      y: { field: 'species', type: 'nominal', title: 'Species found' },
    },
  } as TopLevelSpec;
}

/** Shift scan: the best explanation's score against z, the chosen shift marked. */
export function scanChart(
  title: string,
  points: { z: number; score: number }[],
  best_z: number,
): TopLevelSpec {
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: title,
    config: CONFIG,
    width: 640,
    height: 160,
    layer: [
      {
        data: { values: points.map((p) => ({ z: p.z, score: Math.max(0, p.score), base: 0 })) },
        mark: { type: 'rule', color: '#0072B2', strokeWidth: 2 },
        encoding: {
          x: { field: 'z', type: 'quantitative', title: 'Redshift z', scale: { zero: false } },
          y: { field: 'base', type: 'quantitative', title: 'Evidence score' },
          y2: { field: 'score' },
        },
      },
      {
        data: { values: [{ z: best_z }] },
        mark: { type: 'rule', color: '#D55E00', strokeDash: [4, 3] },
        encoding: { x: { field: 'z', type: 'quantitative' } },
      },
    ],
  } as TopLevelSpec;
}
