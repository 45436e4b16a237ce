/**
 * Refits the confidence calibration (src/identify/model.ts CONFIDENCE_CALIBRATION) on synthetic
 * sessions and the development half of the real benchmark together:
 *
 *   npm run bench:identify -- --n 500 --seed 1 --dump-raw /tmp/synthetic.json
 *   npm run bench:real -- --half dev --dump-raw /tmp/dev.json
 *   npx tsx scripts/fit-confidence.ts /tmp/synthetic.json /tmp/dev.json
 *
 * Each file counts as much as the other in total (every observation of a file weighs
 * 1 / its size), so that the few real cases are not drowned by thousands of synthetic ones,
 * whose explanations are right far more often than real ones. Prints the fit and, for each
 * file, the stated confidence against the share right, before and after.
 */
import { readFileSync } from 'node:fs';
import { CONFIDENCE_CALIBRATION, calibratedConfidence } from '../src/identify/model.js';
import { fitPlatt, type RawOutcome } from './platt.js';

const files = process.argv.slice(2);
if (files.length === 0) {
  process.stderr.write('usage: fit-confidence FILE.json [FILE.json …]\n');
  process.exit(2);
}
const sets = files.map((f) => ({ file: f, rows: JSON.parse(readFileSync(f, 'utf8')) as RawOutcome[] }));
const all = sets.flatMap((s) => s.rows);
const weights = sets.flatMap((s) => s.rows.map(() => 1 / s.rows.length));
const fit = fitPlatt(all, weights);
console.log(
  `fit: CONFIDENCE_CALIBRATION = { slope: ${fit.slope.toFixed(2)}, intercept: ${fit.intercept.toFixed(2)} } (now ${CONFIDENCE_CALIBRATION.slope}, ${CONFIDENCE_CALIBRATION.intercept})`,
);
const pct = (x: number) => `${(100 * x).toFixed(1)} %`;
for (const s of sets) {
  console.log(
    `\n${s.file}: ${s.rows.length} sessions, ${pct(s.rows.filter((r) => r.right).length / s.rows.length)} right`,
  );
  for (const [label, cal] of [
    ['now', CONFIDENCE_CALIBRATION],
    ['fitted', fit],
  ] as const) {
    const stated = s.rows.map((r) => calibratedConfidence(r.raw, cal));
    const mean = stated.reduce((a, x) => a + x, 0) / stated.length;
    const confident = s.rows.filter((_, i) => (stated[i] as number) >= 0.7);
    const wrongConfident = confident.filter((r) => !r.right).length;
    // Brier score: mean squared gap between stated confidence and outcome (lower is better).
    const brier =
      s.rows.reduce((a, r, i) => a + ((stated[i] as number) - (r.right ? 1 : 0)) ** 2, 0) / s.rows.length;
    console.log(
      `  ${label.padEnd(7)} mean stated ${pct(mean)}; stated ≥ 0.7: ${confident.length}, of which wrong ${wrongConfident}; Brier ${brier.toFixed(4)}`,
    );
  }
}
