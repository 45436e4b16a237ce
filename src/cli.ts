#!/usr/bin/env node
/**
 * Command line: argument parsing with commander (the most used and best documented parser for
 * Node), exit codes and terminal output. Each command lives in src/commands/.
 * Exit codes: 0 all good, 1 some input had problems, 2 could not run.
 */
import { Command, CommanderError } from 'commander';
import { CommandFailure, EXIT_CANNOT_RUN, EXIT_OK } from './commands/output.js';
import { PROGRAM_VERSION } from './version.js';

type Register = (program: Command, done: (code: number) => void) => void;

/**
 * Each command's module, loaded only when that command runs: a no-change rebuild is mostly
 * program start, and the identification pipeline (which `identify` and `vet` load) is not
 * needed for it. In the order `--help` lists them.
 */
const COMMANDS: readonly [string, () => Promise<Register>][] = [
  ['identify', async () => (await import('./commands/identify.js')).registerIdentify],
  ['build', async () => (await import('./commands/build.js')).registerBuild],
  ['lookup', async () => (await import('./commands/lookup.js')).registerLookup],
  ['import-nist', async () => (await import('./commands/importNist.js')).registerImportNist],
  ['preview', async () => (await import('./commands/preview.js')).registerPreview],
  ['vet', async () => (await import('./commands/vet.js')).registerVet],
  ['new', async () => (await import('./commands/scaffold.js')).registerScaffold],
];

/** The command named on the command line, or all of them (help, a mistyped name, none). */
async function commandsFor(argv: readonly string[]): Promise<Register[]> {
  const named = argv.slice(2).find((a) => !a.startsWith('-'));
  if (named === undefined && argv.some((a) => a === '--version' || a === '-V')) return [];
  const one = COMMANDS.find(([name]) => name === named);
  return Promise.all((one ? [one] : COMMANDS).map(([, load]) => load()));
}

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
  for (const register of await commandsFor(argv)) register(program, done);
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
