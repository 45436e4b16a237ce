import { describe, expect, it } from 'vitest';
import { MAX_DRAWN_POINTS, profileChart, thinned } from '../../src/report/charts/profile.js';
import { renderChart } from '../../src/report/charts/render.js';

describe('the profile chart', () => {
  it('min–max binning keeps a one-point line however long the profile (common practice)', () => {
    const n = 100_000;
    const x = Array.from({ length: n }, (_, i) => i);
    const y = x.map((i) => (i === 61_234 ? 500 : i % 3));
    const kept = thinned(x, [y]);
    expect(kept.length).toBeLessThanOrEqual(MAX_DRAWN_POINTS + 1);
    expect(kept).toContain(61_234);
    expect(thinned(x.slice(0, 50), [y.slice(0, 50)])).toHaveLength(50);
  });

  it('renders the data, continuum, threshold and numbered lines as one labelled SVG', async () => {
    const x = Array.from({ length: 200 }, (_, i) => i);
    const y = x.map((i) => 10 + 100 * Math.exp(-0.5 * ((i - 80) / 2) ** 2));
    const chart = await renderChart(
      profileChart({
        title: 'Profile test',
        axisTitle: 'Pixel',
        x,
        intensity: y,
        continuum: x.map(() => 10),
        threshold: x.map(() => 15),
        lines: [
          { x: 80, number: 1, status: 'identified' },
          { x: 150, number: 0, status: 'dropped' },
        ],
      }),
    );
    expect(chart.svg).toMatch(/^<svg[^>]*role="img" aria-label="Profile test"/);
    expect(chart.svg).toContain('>1<');
    expect(chart.svg).toContain('×');
  });
});
