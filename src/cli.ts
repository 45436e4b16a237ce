#!/usr/bin/env node
/**
 * Command line: argument parsing with commander (the most used and best documented parser for
 * Node), exit codes and terminal output. Each command lives in src/commands/.
 * Exit codes: 0 all good, 1 some input had problems, 2 could not run.
 */
import { Command, CommanderError } from 'commander';
import { registerBuild } from './commands/build.js';
import { CommandFailure, EXIT_CANNOT_RUN, EXIT_OK } from './commands/common.js';
import { registerIdentify } from './commands/identify.js';
import { registerImportNist } from './commands/importNist.js';
import { registerLookup } from './commands/lookup.js';
import { registerPreview } from './commands/preview.js';
import { registerScaffold } from './commands/scaffold.js';
import { registerVet } from './commands/vet.js';
import { PROGRAM_VERSION } from './version.js';

export async function main(argv: string[]): Promise<number> {
  const program = new Command();
  let code = EXIT_OK;
  const done = (c: number) => {
    code = c;
  };
  program
    .name('lineledger')
    .description('Diffraction-grating line measurements in; identified, printable spectral-line records out.')
    .version(PROGRAM_VERSION)
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  for (const register of [
    registerIdentify,
    registerBuild,
    registerLookup,
    registerImportNist,
    registerPreview,
    registerVet,
    registerScaffold,
  ])
    register(program, done);
  try {
    await program.parseAsync(argv);
  } catch (e) {
    if (e instanceof CommanderError) return e.exitCode === 0 ? EXIT_OK : EXIT_CANNOT_RUN;
    if (e instanceof CommandFailure) {
      process.stderr.write(`lineledger: ${e.message}\n`);
      return e.exitCode;
    }
    throw e;
  }
  return code;
}

/** Exit once stdout and stderr are flushed: a pipe takes large output in pieces, and exiting at once cut it off. */
function exitAfterFlush(code: number): void {
  process.stdout.write('', () => process.stderr.write('', () => process.exit(code)));
}

main(process.argv).then(
  (code) => exitAfterFlush(code),
  (e: unknown) => {
    process.stderr.write(`lineledger: internal error: ${(e as Error).stack ?? String(e)}\n`);
    process.exit(EXIT_CANNOT_RUN);
  },
);
