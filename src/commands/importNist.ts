/** `lineledger import-nist FILE --species "Fe I" --out lines.tsv`: an ASD export (delimited or ASCII table) → catalog TSV. */
import { renameSync, writeFileSync } from 'node:fs';
import type { Command } from 'commander';
import { convertNistExport, type ExportMedium } from '../lines/nistImport.js';
import { checkFileTarget } from '../write/guard.js';
import { CommandFailure, EXIT_OK, EXIT_PROBLEMS, printDiagnostics, readTextOrUndefined } from './common.js';

interface ImportFlags {
  species?: string;
  medium?: string;
  sourceKey: string;
  out?: string;
  quiet?: boolean;
  force?: boolean;
}

function importNist(file: string, opts: ImportFlags): number {
  if (opts.medium !== undefined && opts.medium !== 'air' && opts.medium !== 'vacuum')
    throw new CommandFailure(`--medium must be air or vacuum, not "${opts.medium}"`);
  // Before any work: the output must not be the input, a folder, or a file the user has.
  const refused = opts.out === undefined ? null : checkFileTarget(opts.out, [file], opts.force === true);
  if (refused) throw new CommandFailure(refused);
  const text = readTextOrUndefined(file);
  if (text === undefined) throw new CommandFailure(`cannot read ${file}`);
  const outcome = convertNistExport(text, file, {
    species: opts.species?.trim().replace(/\s+/g, ' ') ?? null,
    medium: (opts.medium as ExportMedium | undefined) ?? null,
    sourceKey: opts.sourceKey,
  });
  if (!outcome.ok) {
    printDiagnostics(outcome.diagnostics, text);
    return EXIT_PROBLEMS;
  }
  if (!opts.quiet) printDiagnostics(outcome.warnings, text);
  const { rows, tsv } = outcome.value;
  if (opts.out === undefined) {
    process.stdout.write(tsv);
  } else {
    try {
      // Whole or not at all: a temporary file renamed over the target.
      const tmp = `${opts.out}.${process.pid}.tmp`;
      writeFileSync(tmp, tsv, { flag: 'wx' });
      renameSync(tmp, opts.out);
    } catch (e) {
      throw new CommandFailure(`cannot write ${opts.out}: ${(e as Error).message}`);
    }
  }
  const species = [...new Set(rows.map((r) => r.species))].join(', ');
  process.stderr.write(
    `lineledger: ${rows.length} lines of ${species}${opts.out ? ` written to ${opts.out}` : ''}; every row cites source key "${opts.sourceKey}"\n`,
  );
  return EXIT_OK;
}

export function registerImportNist(program: Command, done: (code: number) => void): void {
  program
    .command('import-nist')
    .description(
      'convert a NIST ASD lines-form export (tab-delimited, CSV or ASCII table) into the catalog TSV format',
    )
    .argument('<file>', 'the exported text file')
    .option('--species <name>', 'the spectrum to keep, e.g. "Fe I" (default: every spectrum of the export)')
    .option('--medium <air|vacuum>', 'medium of wavelength columns whose names do not say')
    .option('--source-key <key>', 'source key written in every row', 'nist-asd')
    .option('--out <file>', 'write the TSV here (default: print it)')
    .option('--force', 'replace the --out file if it exists (never the input file)')
    .option('-q, --quiet', 'print only errors')
    .action((file: string, opts: ImportFlags) => done(importNist(file, opts)));
}
