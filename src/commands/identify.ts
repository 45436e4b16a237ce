/** `lineledger identify FILE [--json]`: one session, reduced and identified, printed. */
import { readFileSync } from 'node:fs';
import type { Command } from 'commander';
import { runSession } from '../pipeline.js';
import { fixed, percent, probability } from '../report/format.js';
import { buildResult, type ResultJson } from '../report/result.js';
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
  out.push('  rank  species        score  confidence  matched/expected  false alarm');
  result.candidates.slice(0, 8).forEach((c, i) => {
    out.push(
      `  ${String(i + 1).padStart(4)}  ${c.display.padEnd(12)} ${fixed(c.score, 1).padStart(7)}  ${percent(c.confidence).padStart(10)}  ${`${c.matched}/${c.expected}`.padStart(16)}  ${probability(c.false_alarm).padStart(11)}`,
    );
  });
  out.push('');
  out.push(`  line  wavelength (${result.medium} nm)  status       assignment`);
  for (const l of result.lines) {
    const a = l.assignment;
    const shown = result.medium === 'air' ? l.air_nm : l.vacuum_nm;
    out.push(
      `  ${String(l.index + 1).padStart(4)}  ${fixed(shown, 3).padStart(19)}  ${l.status.padEnd(11)}  ${a ? `${a.display} ${fixed(a.ref_vacuum_nm, 3)} vac (${fixed(a.residual_nm, 3)} nm, ${percent(l.probability)})` : '—'}`,
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
  const outcome = runSession(file, bytes, catalog, { instrumentDefaults: config.defaultInstrument });
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
