import { describe, expect, it } from 'vitest';
import { readProfileBytes } from '../../src/session/profile/read.js';

const enc = (s: string) => new TextEncoder().encode(s);
const pixel = { axis: 'pixel' as const, nmPerUnit: 1 };
const rows = (n: number, sep = ',') => Array.from({ length: n }, (_, i) => `${i}${sep}${10 + i}`).join('\n');

// Comma- and tab-separated rows as RFC 4180 (CSV) and the IANA text/tab-separated-values
// registration describe them (numbers only, so no quoting); semicolons, runs of spaces and
// # comment lines are what spectrometer software writes (common practice).
describe('delimited-text profiles', () => {
  it('reads commas, tabs, semicolons and spaces, skips a header and # comments', () => {
    for (const sep of [',', '\t', ';', '   ']) {
      const r = readProfileBytes(
        enc(`# camera profile\npixel${sep}counts\n${rows(20, sep)}\n`),
        'p.csv',
        pixel,
      );
      expect(r.problems).toEqual([]);
      expect(r.profile?.x.slice(0, 3)).toEqual([0, 1, 2]);
      expect(r.profile?.intensity.slice(0, 3)).toEqual([10, 11, 12]);
      expect(r.profile?.sigma).toBeNull();
    }
  });
  it('a third column is the uncertainty; a wavelength column is scaled to nm', () => {
    const text = Array.from({ length: 20 }, (_, i) => `${4000 + i},${i},0.5`).join('\n');
    const r = readProfileBytes(enc(text), 'p.csv', { axis: 'wavelength', nmPerUnit: 0.1 });
    expect(r.profile?.x[1]).toBeCloseTo(400.1, 12);
    expect(r.profile?.sigma?.[0]).toBe(0.5);
  });
  it('a falling axis is turned round', () => {
    const text = Array.from({ length: 20 }, (_, i) => `${100 - i},${i}`).join('\n');
    const r = readProfileBytes(enc(text), 'p.csv', pixel);
    expect(r.profile?.x[0]).toBe(81);
    expect(r.profile?.intensity[0]).toBe(19);
  });
  it('an axis that doubles back, too few points, a ragged row or a bad uncertainty are problems', () => {
    const back = `${rows(10)}\n5,1\n${rows(10)}`;
    expect(readProfileBytes(enc(back), 'p.csv', pixel).problems[0]?.code).toBe('profile-not-monotonic');
    expect(readProfileBytes(enc(rows(5)), 'p.csv', pixel).problems[0]?.code).toBe('profile-too-short');
    expect(readProfileBytes(enc(`${rows(20)}\n21,3,4,5`), 'p.csv', pixel).problems[0]?.message).toMatch(
      /line 21 has 4 columns/,
    );
    const zeroSigma = Array.from({ length: 20 }, (_, i) => `${i},1,${i === 4 ? 0 : 1}`).join('\n');
    expect(readProfileBytes(enc(zeroSigma), 'p.csv', pixel).problems[0]?.code).toBe('profile-bad-value');
    expect(readProfileBytes(enc(`${rows(20)}\nabc,1`), 'p.csv', pixel).problems[0]?.code).toBe(
      'profile-bad-row',
    );
  });
});
