/** `lineledger identify FILE [--json]`: one session, reduced and identified, printed. */
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import { readProfileInput } from '../input/sessionFiles.js';
import { runSession } from '../pipeline.js';
import { display, fixed, percent, probability } from '../report/format.js';
import { buildResult, type ResultJson } from '../report/result.js';
import { evidenceWords } from '../report/wording.js';
import { profileFileOf } from '../session/profile/ref.js';
import { PROGRAM_VERSION } from '../version.js';
import {
  EXIT_CANNOT_RUN,
  EXIT_OK,
  EXIT_PROBLEMS,
  loadCatalogFor,
  loadConfig,
  printDiagnostics,
} from './common.js';

export function formatRanking(title: string, id: string, result: ResultJson): string {
  const out: string[] = [];
  out.push(`${title} (${id})`);
  out.push(`  ${result.summary}`);
  out.push('');
  // The result's confidence is in the summary (as on the page); species get evidence words.
  const shown = result.candidates.filter(
    (c) => result.explanation.species.includes(c.species) || (c.matched > 0 && c.score > 0),
  );
  out.push('  rank  species        score  evidence     matched/expected  chance match');
  shown.slice(0, 8).forEach((c, i) => {
    out.push(
      `  ${String(i + 1).padStart(4)}  ${c.display.padEnd(12)} ${fixed(c.score, 1).padStart(7)}  ${evidenceWords(c.score).padEnd(11)}  ${`${c.matched}/${c.expected}`.padStart(16)}  ${probability(c.false_alarm).padStart(12)}`,
    );
  });
  const others = result.candidates.length - Math.min(8, shown.length);
  if (others > 0) out.push(`  (${others} other species tried; all are in --json)`);
  out.push('');
  // A removed shift makes the compared wavelengths rest-frame; a fitted reading offset, corrected ones.
  const frame = result.shift ? 'rest ' : result.scale_correction ? 'corrected ' : '';
  out.push(
    `  line  wavelength (${frame}${result.medium} nm)  status       reference (${frame}${result.medium} nm, residual)`,
  );
  for (const l of result.lines) {
    const a = l.assignment;
    // Rest frame, like the reference it is compared with (equal to observed without a shift).
    const lineNm = display(l.rest_vacuum_nm, result.medium);
    out.push(
      `  ${String(l.index + 1).padStart(4)}  ${fixed(lineNm, 3).padStart(19)}  ${l.status.padEnd(11)}  ${a ? `${a.display}${a.faint ? ' (faint line)' : ''} ${fixed(display(a.ref_vacuum_nm, result.medium), 3)} (${a.residual_nm >= 0 ? '+' : ''}${fixed(a.residual_nm, 3)} nm${l.status === 'tentative' ? `, ${percent(l.probability)}` : ''})` : '—'}`,
    );
  }
  return out.join('\n');
}

function identify(file: string, opts: { json?: boolean; config?: string }): number {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch (e) {
    process.stderr.write(`lineledger: cannot read ${file}: ${(e as Error).message}\n`);
    return EXIT_CANNOT_RUN;
  }
  const config = loadConfig(opts.config);
  const catalog = loadCatalogFor(config);
  const outcome = runSession(file, bytes, catalog, {
    instrumentDefaults: config.defaultInstrument,
    profile: readProfileInput(file, bytes, profileFileOf),
  });
  const text = bytes.toString('utf8');
  if (!outcome.ok) {
    printDiagnostics(outcome.diagnostics, text);
    return EXIT_PROBLEMS;
  }
  printDiagnostics(outcome.warnings, text);
  const result = buildResult(outcome.reduction, outcome.identification, catalog, PROGRAM_VERSION);
  process.stdout.write(
    opts.json
      ? `${JSON.stringify(result, null, 2)}\n`
      : `${formatRanking(outcome.session.title, outcome.session.id, result)}\n`,
  );
  return EXIT_OK;
}

export function registerIdentify(program: Command, done: (code: number) => void): void {
  program
    .command('identify')
    .description('reduce and identify one session file; print a ranking (or the result contract with --json)')
    .argument('<file>', 'session YAML file')
    .option('--json', 'print the machine-readable result')
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .action((file: string, opts: { json?: boolean; config?: string }) => done(identify(file, opts)));
}
