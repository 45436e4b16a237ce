/**
 * The recorded profile with what was found in it: the data (thin black line), the continuum
 * (dashed blue), the detection threshold (dotted orange) and a rule at each found line,
 * coloured by its assignment and labelled with its number. Pure data → Vega-Lite spec.
 */
import type { TopLevelSpec } from 'vega-lite';

const FONT = 'DejaVu Sans, Liberation Sans, Arial, sans-serif';
/** A page-sized chart needs no more points than this: bins keep each one's minimum and maximum. */
export const MAX_DRAWN_POINTS = 1600;

export interface ProfileChartInput {
  title: string;
  axisTitle: string;
  x: readonly number[];
  intensity: readonly number[];
  continuum: readonly number[];
  threshold: readonly number[];
  lines: { x: number; number: number; status: 'identified' | 'tentative' | 'unexplained' | 'dropped' }[];
}

/** Min–max binning: a narrow line keeps its peak however many points share its bin. */
export function thinned(x: readonly number[], ys: readonly (readonly number[])[]): number[] {
  const n = x.length;
  if (n <= MAX_DRAWN_POINTS) return Array.from({ length: n }, (_, i) => i);
  const bins = Math.floor(MAX_DRAWN_POINTS / 2);
  const keep = new Set<number>();
  const y = ys[0]!;
  for (let b = 0; b < bins; b++) {
    const from = Math.floor((b * n) / bins);
    const to = Math.floor(((b + 1) * n) / bins);
    let lo = from;
    let hi = from;
    for (let i = from; i < to; i++) {
      if (y[i]! < y[lo]!) lo = i;
      if (y[i]! > y[hi]!) hi = i;
    }
    keep.add(lo);
    keep.add(hi);
  }
  keep.add(n - 1);
  return [...keep].sort((a, b) => a - b);
}

const STATUS = ['identified', 'tentative', 'unexplained', 'dropped'];
const STATUS_COLOUR = ['#0072B2', '#E69F00', '#D55E00', '#999999'];

export function profileChart(input: ProfileChartInput): TopLevelSpec {
  const idx = thinned(input.x, [input.intensity]);
  const round = (v: number) => Number(v.toPrecision(7));
  const rows = idx.map((i) => ({
    x: round(input.x[i]!),
    y: round(input.intensity[i]!),
    c: round(input.continuum[i]!),
    t: round(input.threshold[i]!),
  }));
  const x = {
    field: 'x',
    type: 'quantitative' as const,
    scale: { zero: false, nice: false },
    title: input.axisTitle,
  };
  const yScale = { zero: false };
  return {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    description: input.title,
    config: {
      aria: false,
      font: FONT,
      view: { stroke: null },
      axis: { labelFontSize: 11, titleFontSize: 12, grid: false },
      legend: { labelFontSize: 11, titleFontSize: 12, orient: 'bottom' as const },
      background: 'white',
    },
    width: 640,
    height: 220,
    layer: [
      {
        data: { values: rows },
        mark: { type: 'line', color: '#000000', strokeWidth: 0.8 },
        encoding: { x, y: { field: 'y', type: 'quantitative', scale: yScale, title: 'Intensity' } },
      },
      {
        data: { values: rows },
        mark: { type: 'line', color: '#0072B2', strokeDash: [6, 3], strokeWidth: 1.2 },
        encoding: { x, y: { field: 'c', type: 'quantitative' } },
      },
      {
        data: { values: rows },
        mark: { type: 'line', color: '#E69F00', strokeDash: [2, 2], strokeWidth: 1.2 },
        encoding: { x, y: { field: 't', type: 'quantitative' } },
      },
      {
        data: {
          values: input.lines.map((l) => ({
            ...l,
            x: round(l.x),
            label: l.status === 'dropped' ? '×' : `${l.number}`,
          })),
        },
        layer: [
          {
            mark: { type: 'rule', strokeWidth: 1.5, opacity: 0.8 },
            encoding: {
              x,
              color: {
                field: 'status',
                type: 'nominal',
                title: 'Found line',
                scale: { domain: STATUS, range: STATUS_COLOUR },
              },
            },
          },
          {
            mark: { type: 'text', baseline: 'top', dy: 2, fontSize: 10 },
            encoding: { x, y: { value: 0 }, text: { field: 'label' } },
          },
        ],
      },
    ],
  };
}
