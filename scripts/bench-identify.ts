/**
 * Identification benchmark (npm run bench:identify): synthetic sessions drawn from the
 * catalog with a fixed seed, run through the whole pipeline, scored against their truth.
 * Prints accuracy by scenario, mixture precision/recall, the share answered "ambiguous",
 * shift recovery and a reliability table (stated confidence against observed accuracy).
 *   --seed N     seed (default 20261202)
 *   --n N        sessions per scenario (default 200)
 *   --show-wrong   print each confidently wrong answer (--yaml: with its session)
 *   --show-missed  print each mixture whose answer misses a gas of the truth
 *   --fit        also fit the Platt scaling of the confidence (src/identify/model.ts) on these results
 */
import { writeFileSync } from 'node:fs';
import { calibratedConfidence } from '../src/identify/model.js';
import { loadCatalog } from '../src/lines/load.js';
import { runSession } from '../src/pipeline.js';
import { numberArg } from './args.js';
import { fitPlatt, type RawOutcome } from './platt.js';
import { makeSession, rng, type SyntheticOptions, visibleLines } from './synthetic.js';

const args = process.argv.slice(2);
const arg = (name: string, fallback: number) => numberArg(args, name, fallback);
const SEED = arg('--seed', 20261202);
const N = arg('--n', 200);
const FIT = args.includes('--fit');

const loaded = loadCatalog();
if (!loaded.ok) throw new Error('catalog has problems');
const catalog = loaded.value;
const rand = rng(SEED);
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rand() * xs.length)] as T;

const VISIBLE: [number, number] = [400, 700];
const tubeGases = (catalog.groups.get('discharge-gases')?.species ?? []).filter(
  (s) => visibleLines(catalog, s, VISIBLE, 'air', 0).length >= 4,
);
const quasarSpecies = ['H I', 'Mg II', 'C III', 'C IV', 'O III', 'O II', 'Ne III', 'He II'].filter((s) =>
  catalog.species.has(s),
);

interface Outcome {
  scenario: string;
  truth: string[];
  answer: string[];
  status: string;
  confidence: number;
  rawConfidence: number;
  topCandidates: string[];
  contenders: { species: string[]; score: number }[];
  zTrue: number | null;
  z: number | null;
  zSigma: number | null;
  lines: number;
  yaml: string;
}

function run(scenario: string, make: () => SyntheticOptions): Outcome[] {
  const out: Outcome[] = [];
  let guard = 0;
  while (out.length < N && guard++ < N * 20) {
    const options = make();
    const s = makeSession(catalog, rand, options);
    if (!s) continue;
    if (options.z !== null && s.lineCount < 4) continue;
    const r = runSession('bench.yaml', s.yaml, catalog);
    if (!r.ok) throw new Error(`benchmark session failed: ${JSON.stringify(r.diagnostics[0])}\n${s.yaml}`);
    const e = r.identification.explanation;
    out.push({
      scenario,
      truth: s.truth,
      answer: e.species.filter((x) => !r.identification.candidates.find((c) => c.species === x)?.telluric),
      status: e.status,
      confidence: e.confidence,
      rawConfidence: e.raw_confidence,
      topCandidates: r.identification.candidates.map((c) => c.species),
      contenders: e.contenders.map((c) => ({ species: c.species, score: c.score })),
      zTrue: s.z,
      z: r.identification.shift?.z ?? null,
      zSigma: r.identification.shift?.z_sigma ?? null,
      lines: s.lineCount,
      yaml: s.yaml,
    });
  }
  return out;
}

const same = (a: readonly string[], b: readonly string[]) =>
  a.length === b.length && a.every((x, i) => x === b[i]);
const pct = (x: number) => `${(100 * x).toFixed(1)} %`;

const t0 = performance.now();
const results: Outcome[] = [];
for (const sigma of [0.1, 0.5, 1, 2]) {
  results.push(
    ...run(`single gas, σ ${sigma} nm`, () => ({
      species: [pick(tubeGases)],
      sigma_nm: sigma,
      range_nm: VISIBLE,
      medium: 'air',
      sourceKind: 'lamp',
      z: null,
      searchRange: null,
      spuriousMean: 0.5,
      groups: ['discharge-gases'],
    })),
  );
}
results.push(
  ...run('two gases, σ 0.5 nm', () => {
    const a = pick(tubeGases);
    let b = pick(tubeGases);
    while (b === a) b = pick(tubeGases);
    return {
      species: [a, b],
      sigma_nm: 0.5,
      range_nm: VISIBLE,
      medium: 'air',
      sourceKind: 'lamp',
      z: null,
      searchRange: null,
      spuriousMean: 0.5,
      groups: ['discharge-gases'],
    };
  }),
);
results.push(
  ...run('unknown redshift, σ 0.5 nm', () => ({
    species: rand() < 0.6 ? ['H I'] : ['H I', pick(quasarSpecies.filter((s) => s !== 'H I'))],
    sigma_nm: 0.5,
    range_nm: [380, 900],
    medium: 'vacuum',
    sourceKind: 'galaxy',
    z: rand() * 0.5,
    searchRange: [0, 0.6],
    spuriousMean: 0.3,
    groups: ['quasar'],
  })),
);
const elapsed = performance.now() - t0;
if (args.includes('--show-wrong')) {
  for (const r of results.filter((x) => x.status === 'identified' && !same(x.answer, x.truth))) {
    console.log(
      `WRONG ${r.scenario}: truth ${r.truth.join('+')} z=${r.zTrue?.toFixed(4)} → ${r.answer.join('+')} z=${r.z?.toFixed(4)} (${pct(r.confidence)}), ${r.lines} lines`,
    );
    if (args.includes('--yaml')) console.log(r.yaml);
  }
}

if (args.includes('--show-missed')) {
  // Mixtures where a gas of the truth is missing from the answer.
  for (const r of results.filter((x) => x.truth.length > 1 && !x.truth.every((t) => x.answer.includes(t))))
    console.log(
      `MISSED ${r.scenario}: truth ${r.truth.join('+')} → ${r.answer.join('+') || 'nothing'} (${r.status} ${pct(r.confidence)}), ${r.lines} lines; contenders ${r.contenders.map((c) => `${c.species.join('+')} ${c.score.toFixed(1)}`).join(', ')}`,
    );
}

console.log(
  `lineledger identification benchmark — seed ${SEED}, ${results.length} sessions, ${(elapsed / 1000).toFixed(1)} s\n`,
);
console.log('scenario                        n   exact   top-1   top-3   ambiguous   wrong-confident');
for (const scenario of [...new Set(results.map((r) => r.scenario))]) {
  const rs = results.filter((r) => r.scenario === scenario);
  const exact = rs.filter((r) => same(r.answer, r.truth)).length / rs.length;
  const top1 = rs.filter((r) => r.truth.includes(r.topCandidates[0] ?? '')).length / rs.length;
  const top3 =
    rs.filter((r) => r.truth.every((t) => r.topCandidates.slice(0, 3 + r.truth.length - 1).includes(t)))
      .length / rs.length;
  const ambiguous = rs.filter((r) => r.status === 'ambiguous').length / rs.length;
  const wrong = rs.filter((r) => r.status === 'identified' && !same(r.answer, r.truth)).length / rs.length;
  console.log(
    `${scenario.padEnd(30)} ${String(rs.length).padStart(3)}  ${pct(exact).padStart(7)} ${pct(top1).padStart(7)} ${pct(top3).padStart(7)}  ${pct(ambiguous).padStart(9)}  ${pct(wrong).padStart(9)}`,
  );
}

const mix = results.filter((r) => r.scenario.startsWith('two gases'));
let tp = 0;
let fp = 0;
let fn = 0;
for (const r of mix) {
  tp += r.answer.filter((s) => r.truth.includes(s)).length;
  fp += r.answer.filter((s) => !r.truth.includes(s)).length;
  fn += r.truth.filter((s) => !r.answer.includes(s)).length;
}
const bothFound =
  mix.filter((r) => r.truth.every((t) => r.answer.includes(t))).length / Math.max(1, mix.length);
console.log(
  `\nmixtures: precision ${pct(tp / Math.max(1, tp + fp))}, recall ${pct(tp / Math.max(1, tp + fn))}, both species found ${pct(bothFound)}`,
);

const shifted = results.filter((r) => r.zTrue !== null);
const within = shifted.filter(
  (r) => r.z !== null && r.zSigma !== null && Math.abs(r.z - (r.zTrue ?? 0)) <= 3 * Math.max(r.zSigma, 1e-6),
);
const within01 = shifted.filter((r) => r.z !== null && Math.abs(r.z - (r.zTrue ?? 0)) <= 0.01);
console.log(
  `redshift: ${shifted.length} sessions with ≥ 4 lines; within 3σ ${pct(within.length / Math.max(1, shifted.length))}; within 0.01 ${pct(within01.length / Math.max(1, shifted.length))}`,
);

function reliability(confidenceOf: (r: Outcome) => number, label: string) {
  console.log(
    `\nreliability (${label}): stated confidence of the explanation vs. how often it was exactly right`,
  );
  console.log('decile        n   stated   observed   gap');
  let worst = 0;
  for (let d = 0; d < 10; d++) {
    const rs = results.filter((r) => {
      const c = confidenceOf(r);
      return c >= d / 10 && (c < (d + 1) / 10 || (d === 9 && c <= 1));
    });
    if (rs.length === 0) continue;
    const stated = rs.reduce((a, r) => a + confidenceOf(r), 0) / rs.length;
    const observed = rs.filter((r) => same(r.answer, r.truth)).length / rs.length;
    const gap = 100 * (observed - stated);
    if (rs.length >= 20) worst = Math.max(worst, Math.abs(gap));
    console.log(
      `${(d / 10).toFixed(1)}–${((d + 1) / 10).toFixed(1)}  ${String(rs.length).padStart(5)}   ${pct(stated).padStart(7)}   ${pct(observed).padStart(7)}   ${gap >= 0 ? '+' : ''}${gap.toFixed(1)}`,
    );
  }
  console.log(`largest gap in a decile with ≥ 20 sessions: ${worst.toFixed(1)} points`);
}
reliability((r) => r.confidence, 'as reported');

if (args.includes('--dump-raw')) {
  const file = args[args.indexOf('--dump-raw') + 1] as string;
  const rows: RawOutcome[] = results.map((r) => ({ raw: r.rawConfidence, right: same(r.answer, r.truth) }));
  writeFileSync(file, `${JSON.stringify(rows)}\n`);
  console.log(`wrote ${rows.length} raw confidences to ${file}`);
}

if (FIT) {
  const { slope: a, intercept: b } = fitPlatt(
    results.map((r) => ({ raw: r.rawConfidence, right: same(r.answer, r.truth) })),
  );
  console.log(
    `\nfit: CONFIDENCE_CALIBRATION = { slope: ${a.toFixed(3)}, intercept: ${b.toFixed(3)} } (Platt scaling on ${results.length} sessions)`,
  );
  reliability(
    (r) => calibratedConfidence(r.rawConfidence, { slope: a, intercept: b }),
    'with the fitted scaling',
  );
}
