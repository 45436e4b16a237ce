#!/usr/bin/env node
/**
 * Command line: argument parsing (commander, the most used and best documented parser for
 * Node), exit codes and terminal output. Exit codes: 0 all good, 1 some input had problems,
 * 2 could not run (bad arguments, unreadable catalog or folder).
 */
import { readFileSync } from 'node:fs';
import { Command, CommanderError } from 'commander';
import { buildSite } from './build.js';
import { type Diagnostic, formatDiagnosticWithSource } from './diagnostics.js';
import { loadCatalog } from './lines/load.js';
import type { Catalog } from './lines/types.js';
import { runSession } from './pipeline.js';
import { fixed, percent, probability } from './report/format.js';
import { buildResult } from './report/result.js';
import { PROGRAM_VERSION } from './version.js';

const EXIT_OK = 0;
const EXIT_PROBLEMS = 1;
const EXIT_CANNOT_RUN = 2;

function printDiagnostics(diagnostics: readonly Diagnostic[], sourceText?: string): void {
  for (const d of diagnostics) process.stderr.write(`${formatDiagnosticWithSource(d, sourceText)}\n`);
}

function catalogOrExit(): Catalog {
  const catalog = loadCatalog();
  if (!catalog.ok) {
    printDiagnostics(catalog.diagnostics);
    process.stderr.write('lineledger: the line catalog has problems; fix data/lines first\n');
    process.exit(EXIT_CANNOT_RUN);
  }
  return catalog.value;
}

function identifyCommand(file: string, opts: { json?: boolean }): number {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch (e) {
    process.stderr.write(`lineledger: cannot read ${file}: ${(e as Error).message}\n`);
    return EXIT_CANNOT_RUN;
  }
  const catalog = catalogOrExit();
  const outcome = runSession(file, bytes, catalog);
  if (!outcome.ok) {
    printDiagnostics(outcome.diagnostics, bytes.toString('utf8'));
    return EXIT_PROBLEMS;
  }
  printDiagnostics(outcome.warnings, bytes.toString('utf8'));
  const result = buildResult(outcome.reduction, outcome.identification, catalog, PROGRAM_VERSION);
  if (opts.json) {
    process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
    return EXIT_OK;
  }
  const out: string[] = [];
  out.push(`${outcome.session.title} (${outcome.session.id})`);
  out.push(`  ${result.summary}`);
  out.push('');
  out.push('  rank  species        score  confidence  matched/expected  false alarm');
  result.candidates.slice(0, 8).forEach((c, i) => {
    out.push(
      `  ${String(i + 1).padStart(4)}  ${c.species.padEnd(12)} ${fixed(c.score, 1).padStart(7)}  ${percent(c.confidence).padStart(10)}  ${`${c.matched}/${c.expected}`.padStart(16)}  ${probability(c.false_alarm).padStart(11)}`,
    );
  });
  out.push('');
  out.push('  line  wavelength (nm)  assignment');
  for (const l of result.lines) {
    const a = l.assignment;
    const shown = result.medium === 'air' ? l.air_nm : l.vacuum_nm;
    out.push(
      `  ${String(l.index + 1).padStart(4)}  ${fixed(shown, 3).padStart(15)}  ${a ? `${a.species} ${fixed(a.ref_vacuum_nm, 3)} vac (${fixed(a.residual_nm, 3)} nm)` : 'unexplained'}`,
    );
  }
  process.stdout.write(`${out.join('\n')}\n`);
  return EXIT_OK;
}

async function buildCommand(
  dir: string,
  opts: { out: string; title: string; quiet?: boolean },
): Promise<number> {
  const catalog = catalogOrExit();
  let report: Awaited<ReturnType<typeof buildSite>>;
  try {
    report = await buildSite(
      {
        inputDir: dir,
        outDir: opts.out,
        settings: { title: opts.title, introMarkdown: '' },
        programVersion: PROGRAM_VERSION,
        sourceDateEpoch: process.env.SOURCE_DATE_EPOCH,
      },
      catalog,
    );
  } catch (e) {
    process.stderr.write(`lineledger: build failed: ${(e as Error).message}\n`);
    return EXIT_CANNOT_RUN;
  }
  for (const o of report.outcomes) {
    const text = (() => {
      try {
        return readFileSync(o.file, 'utf8');
      } catch {
        return undefined;
      }
    })();
    if (!o.ok) printDiagnostics(o.diagnostics, text);
    else if (!opts.quiet) printDiagnostics(o.warnings, text);
  }
  const built = report.outcomes.length - report.failed;
  if (!opts.quiet || report.failed > 0) {
    process.stderr.write(
      `lineledger: built ${built} of ${report.outcomes.length} sessions into ${opts.out}${report.failed ? `; ${report.failed} failed` : ''}\n`,
    );
  }
  return report.failed > 0 ? EXIT_PROBLEMS : EXIT_OK;
}

export async function main(argv: string[]): Promise<number> {
  const program = new Command();
  let code = EXIT_OK;
  program
    .name('lineledger')
    .description('Diffraction-grating line measurements in; identified, printable spectral-line records out.')
    .version(PROGRAM_VERSION)
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  program
    .command('identify')
    .description('reduce and identify one session file; print a ranking (or the result contract with --json)')
    .argument('<file>', 'session YAML file')
    .option('--json', 'print the machine-readable result')
    .action((file: string, opts: { json?: boolean }) => {
      code = identifyCommand(file, opts);
    });
  program
    .command('build')
    .description('build every session of a folder into a static site')
    .argument('<dir>', 'folder of session YAML files')
    .option('--out <dir>', 'output folder', 'site')
    .option('--title <text>', 'archive title', 'lineledger archive')
    .option('-q, --quiet', 'print only problems')
    .action(async (dir: string, opts: { out: string; title: string; quiet?: boolean }) => {
      code = await buildCommand(dir, opts);
    });
  try {
    await program.parseAsync(argv);
  } catch (e) {
    if (e instanceof CommanderError) return e.exitCode === 0 ? EXIT_OK : EXIT_CANNOT_RUN;
    throw e;
  }
  return code;
}

main(process.argv).then(
  (code) => process.exit(code),
  (e: unknown) => {
    process.stderr.write(`lineledger: internal error: ${(e as Error).stack ?? String(e)}\n`);
    process.exit(EXIT_CANNOT_RUN);
  },
);
