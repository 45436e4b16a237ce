/** Progress output: in place on a terminal, plain lines otherwise, per session when verbose. */
import { describe, expect, it } from 'vitest';
import { createProgress, type Verbosity } from '../../src/progress/reporter.js';

function run(isTTY: boolean, verbosity: Verbosity, stepMs: number): string {
  let out = '';
  let t = 0;
  const p = createProgress({ write: (s) => (out += s), isTTY, verbosity, now: () => t, lineEvery: 1000 });
  p.start(4);
  for (const [k, status] of ['identified', 'failed', 'identified', 'ambiguous'].entries()) {
    t += stepMs;
    p.session({ file: `s${k}.yaml`, status, ms: k === 2 ? null : 12.4 });
  }
  p.finish();
  return out;
}

describe('progress', () => {
  it('redraws one line in place on a terminal once the build has run a second, and clears it', () => {
    const out = run(true, 'normal', 400);
    expect(out).not.toContain('\n');
    expect(out).toContain('\r\x1b[Klineledger: 3/4 sessions, 1 failed');
    expect(out).toContain('\r\x1b[Klineledger: 4/4 sessions, 1 failed');
    expect(out).not.toContain('2/4');
    expect(out.endsWith('\r\x1b[K')).toBe(true);
  });

  it('stays silent for a short build', () => {
    expect(run(true, 'normal', 10)).toBe('');
    expect(run(false, 'normal', 10)).toBe('');
  });

  it('writes plain lines, without control characters, when not a terminal', () => {
    const out = run(false, 'normal', 700);
    expect(out).toBe('lineledger: 2/4 sessions, 1 failed\n');
  });

  it('writes a line per session with its status and time when verbose', () => {
    const out = run(false, 'verbose', 10);
    expect(out.split('\n').filter(Boolean)).toEqual([
      'lineledger: s0.yaml: identified (12 ms)',
      'lineledger: s1.yaml: failed (12 ms)',
      'lineledger: s2.yaml: identified (cached)',
      'lineledger: s3.yaml: ambiguous (12 ms)',
    ]);
  });

  it('prints nothing when quiet', () => {
    expect(run(true, 'quiet', 800)).toBe('');
  });
});
