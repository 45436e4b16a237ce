/**
 * Real-observation benchmark (npm run bench:real): published line lists kept in
 * test/real/cases/, each run through the whole pipeline with the bundled catalog and scored
 * against the published assignments. Metrics are defined in test/real/README.md.
 *   --half dev|heldout|all   which half to run (default all; each half is reported apart)
 *   --verbose                per-case line table
 *   --dump-raw FILE          with --half dev: write each case's raw confidence and rightness (for fit-confidence)
 *   --list                   print the cases as a Markdown table (for test/real/README.md) and stop
 */
import { writeFileSync } from 'node:fs';
import { defaultConfig } from '../src/config/read.js';
import type { Identification } from '../src/identify/types.js';
import { loadCatalog } from '../src/lines/load.js';
import { runSession } from '../src/pipeline.js';
import { acceptable, type Half, loadCases, normalizeSpecies, type RealCase } from '../test/real/cases.js';
import type { RawOutcome } from './platt.js';

const args = process.argv.slice(2);
const halfArg = args.includes('--half') ? args[args.indexOf('--half') + 1] : 'all';
if (halfArg !== 'dev' && halfArg !== 'heldout' && halfArg !== 'all') {
  process.stderr.write(`--half must be dev, heldout or all, not ${halfArg}\n`);
  process.exit(2);
}
const VERBOSE = args.includes('--verbose');

/** Thresholds of the metrics (test/real/README.md). */
const CASE_PASS_SHARE = 0.8;
const CONFIDENT = 0.7;

// The catalog as the CLI loads it with no lineledger.yaml: the bundled lists only.
const loaded = loadCatalog(undefined, defaultConfig().catalogs);
if (!loaded.ok) throw new Error(`catalog has problems: ${JSON.stringify(loaded.diagnostics.slice(0, 3))}`);
const catalog = loaded.value;

type LineStatus = 'identified' | 'tentative' | 'unassigned';

/**
 * The species a line was given and how firmly. Reads `assignment` (identified); a `tentative`
 * field on the line, when the identification model provides one, is picked up as tentative.
 * This is the one place to extend when the result types grow.
 */
function lineAnswer(id: Identification, index: number): { species: string | null; status: LineStatus } {
  const line = id.lines.find((l) => l.index === index);
  if (!line) return { species: null, status: 'unassigned' };
  if (line.assignment) return { species: normalizeSpecies(line.assignment.species), status: 'identified' };
  const extended = line as typeof line & { tentative?: { species?: unknown } | null };
  const t = extended.tentative;
  if (t && typeof t.species === 'string')
    return { species: normalizeSpecies(t.species), status: 'tentative' };
  return { species: null, status: 'unassigned' };
}

interface CaseResult {
  c: RealCase;
  ok: boolean;
  failure: string | null;
  right: boolean[];
  answers: { species: string | null; status: LineStatus }[];
  explained: string[];
  status: string;
  confidence: number;
  rawConfidence: number;
  explanationRight: boolean;
  confidentlyWrong: string | null;
}

/** Species published on lines of this case (any acceptable name of any line). */
function publishedSet(c: RealCase): Set<string> {
  return new Set(c.expected.flatMap(acceptable));
}

/** Species that are the sole published species of at least `n` lines. */
function firmSpecies(c: RealCase, n: number): string[] {
  const counts = new Map<string, number>();
  for (const e of c.expected) {
    const a = acceptable(e);
    if (a.length === 1) counts.set(a[0] as string, (counts.get(a[0] as string) ?? 0) + 1);
  }
  return [...counts].filter(([, k]) => k >= n).map(([s]) => s);
}

function score(c: RealCase): CaseResult {
  const r = runSession(`${c.case}.yaml`, c.sessionText, catalog);
  if (!r.ok) {
    const d = r.diagnostics[0];
    return {
      c,
      ok: false,
      failure: d ? `${d.code ?? ''} ${d.message}` : 'session failed',
      right: c.expected.map(() => false),
      answers: c.expected.map(() => ({ species: null, status: 'unassigned' as const })),
      explained: [],
      status: 'failed',
      confidence: 0,
      rawConfidence: 0,
      explanationRight: false,
      confidentlyWrong: null,
    };
  }
  const id = r.identification;
  const answers = c.expected.map((_, i) => lineAnswer(id, i));
  const right = c.expected.map((e, i) => {
    const a = answers[i]!;
    const ok = acceptable(e);
    return ok.length === 0 ? a.species === null : a.species !== null && ok.includes(a.species);
  });
  const explained = id.explanation.species.map(normalizeSpecies);
  const published = publishedSet(c);
  const extra = explained.filter((s) => !published.has(s));
  // Exactly the published set: nothing extra, and every identified published line has one of
  // its acceptable species in the explanation.
  const covered = c.expected.every((e) => {
    const ok = acceptable(e);
    return ok.length === 0 || ok.some((s) => explained.includes(s));
  });
  const explanationRight = extra.length === 0 && covered;
  const missedFirm = firmSpecies(c, 2).filter((s) => !explained.includes(s));
  const confident = id.explanation.status === 'identified' && id.explanation.confidence >= CONFIDENT;
  const confidentlyWrong =
    confident && (missedFirm.length > 0 || extra.length > 0)
      ? [
          missedFirm.length > 0 ? `misses ${missedFirm.join(', ')}` : '',
          extra.length > 0 ? `adds ${extra.join(', ')}` : '',
        ]
          .filter(Boolean)
          .join('; ')
      : null;
  return {
    c,
    ok: true,
    failure: null,
    right,
    answers,
    explained,
    status: id.explanation.status,
    confidence: id.explanation.confidence,
    rawConfidence: id.explanation.raw_confidence,
    explanationRight,
    confidentlyWrong,
  };
}

const pct = (x: number) => (Number.isFinite(x) ? `${(100 * x).toFixed(1)} %` : '—');
const pad = (s: string, n: number) => (s.length >= n ? s : s + ' '.repeat(n - s.length));
const show = (e: RealCase['expected'][number]) =>
  e === null ? '(unidentified)' : Array.isArray(e) ? e.join(' / ') : e;

function printCase(r: CaseResult): void {
  const n = r.right.filter(Boolean).length;
  process.stdout.write(
    `\n${r.c.case} [${r.c.category}] ${n}/${r.right.length} lines right; explanation ${r.status}` +
      ` ${r.confidence.toFixed(2)}: ${r.explained.join(', ') || '(none)'}` +
      `${r.explanationRight ? ' (right)' : ''}${r.confidentlyWrong ? ` CONFIDENTLY WRONG: ${r.confidentlyWrong}` : ''}\n`,
  );
  if (r.failure) process.stdout.write(`  session failed: ${r.failure}\n`);
  r.c.expected.forEach((e, i) => {
    const a = r.answers[i]!;
    const got = a.species === null ? '—' : `${a.species}${a.status === 'tentative' ? ' (tentative)' : ''}`;
    const w = r.c.wavelengths[i];
    process.stdout.write(
      `  ${r.right[i] ? 'ok ' : 'BAD'} ${pad(w === null || w === undefined ? '?' : String(w), 10)} published ${pad(show(e), 22)} got ${got}\n`,
    );
  });
}

function report(half: Half, results: CaseResult[]): void {
  const lines = results.reduce((a, r) => a + r.right.length, 0);
  const rightLines = results.reduce((a, r) => a + r.right.filter(Boolean).length, 0);
  process.stdout.write(`\n== ${half} half: ${results.length} cases, ${lines} lines ==\n`);
  if (results.length === 0) return;
  if (VERBOSE) for (const r of results) printCase(r);
  const shares = results.map((r) => ({
    id: r.c.case,
    share: r.right.length ? r.right.filter(Boolean).length / r.right.length : 0,
  }));
  const passing = shares.filter((s) => s.share >= CASE_PASS_SHARE).length;
  const worst = [...shares].sort((a, b) => a.share - b.share || a.id.localeCompare(b.id))[0]!;
  const wrong = results.filter((r) => r.confidentlyWrong !== null);
  const failed = results.filter((r) => !r.ok);
  process.stdout.write(`line-level agreement: ${rightLines}/${lines} = ${pct(rightLines / lines)}\n`);
  process.stdout.write(
    `case-level agreement (≥ ${100 * CASE_PASS_SHARE} % of lines right): ${passing}/${results.length} = ${pct(passing / results.length)}; worst ${worst.id} ${pct(worst.share)}\n`,
  );
  process.stdout.write(
    `confidently wrong (identified, confidence ≥ ${CONFIDENT}): ${wrong.length}/${results.length} = ${pct(wrong.length / results.length)}\n`,
  );
  for (const r of wrong) process.stdout.write(`  ${r.c.case}: ${r.confidentlyWrong}\n`);
  if (failed.length > 0) {
    process.stdout.write(`sessions that failed to run: ${failed.length}\n`);
    for (const r of failed) process.stdout.write(`  ${r.c.case}: ${r.failure}\n`);
  }
  const right = results.filter((r) => r.explanationRight).length;
  process.stdout.write(
    `explanation exactly right: ${right}/${results.length} = ${pct(right / results.length)}\n`,
  );
  process.stdout.write(
    'reliability (stated explanation confidence vs share of cases whose explanation is right):\n',
  );
  process.stdout.write('  confidence   cases   mean stated   right\n');
  for (let d = 0; d < 10; d++) {
    const inBin = results.filter((r) => Math.min(9, Math.floor(r.confidence * 10)) === d);
    if (inBin.length === 0) continue;
    const mean = inBin.reduce((a, r) => a + r.confidence, 0) / inBin.length;
    const ok = inBin.filter((r) => r.explanationRight).length / inBin.length;
    process.stdout.write(
      `  ${(d / 10).toFixed(1)}–${((d + 1) / 10).toFixed(1)}    ${pad(String(inBin.length), 7)} ${pad(mean.toFixed(2), 13)} ${pct(ok)}\n`,
    );
  }
}

const { cases, problems } = loadCases();
for (const p of problems) process.stderr.write(`${p.file}: ${p.message}\n`);
if (problems.length > 0) process.exit(1);
if (args.includes('--list')) {
  process.stdout.write('| case | half | category | origin | lines | citation |\n|---|---|---|---|---|---|\n');
  for (const c of cases) {
    const cite = c.citation.replace(/\|/g, '/');
    process.stdout.write(
      `| ${c.case} | ${c.half} | ${c.category} | ${c.origin} | ${c.lineCount} | ${cite} |\n`,
    );
  }
  const count = (f: (c: RealCase) => boolean) => cases.filter(f).length;
  process.stdout.write(
    `\n${cases.length} cases: ${count((c) => c.half === 'dev')} dev, ${count((c) => c.half === 'heldout')} held out; ` +
      `${count((c) => c.origin === 'read')} read, ${count((c) => c.origin === 'memory')} from memory.\n`,
  );
  process.exit(0);
}
const halves: Half[] = halfArg === 'all' ? ['dev', 'heldout'] : [halfArg];
const t0 = performance.now();
const DUMP = args.includes('--dump-raw') ? (args[args.indexOf('--dump-raw') + 1] as string) : null;
if (DUMP && halfArg !== 'dev') {
  // The raw confidences feed the confidence calibration: the held-out half never does.
  process.stderr.write('--dump-raw needs --half dev\n');
  process.exit(2);
}
for (const half of halves) {
  const scored = cases.filter((c) => c.half === half).map(score);
  report(half, scored);
  if (DUMP) {
    const rows: RawOutcome[] = scored.map((r) => ({ raw: r.rawConfidence, right: r.explanationRight }));
    writeFileSync(DUMP, `${JSON.stringify(rows)}\n`);
    process.stdout.write(`wrote ${rows.length} raw confidences to ${DUMP}\n`);
  }
}
process.stdout.write(`\n${cases.length} case files; ${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
