/**
 * What every command and cli.ts share to end a run: exit codes, the failure that carries one,
 * and printing diagnostics. Kept apart from the config and catalog readers so that a command
 * that needs neither (--version, a build with nothing to do) does not load them.
 */
import { type Diagnostic, formatDiagnosticsWithSource } from '../diagnostics.js';

export const EXIT_OK = 0;
export const EXIT_PROBLEMS = 1;
export const EXIT_CANNOT_RUN = 2;

/** Thrown inside a command to stop with a message and an exit code (caught in cli.ts). */
export class CommandFailure extends Error {
  constructor(
    message: string,
    readonly exitCode: number = EXIT_CANNOT_RUN,
  ) {
    super(message);
  }
}

export function printDiagnostics(diagnostics: readonly Diagnostic[], sourceText?: string): void {
  // One write per file: 50,000 problems are one string, not 50,000 system calls.
  const lines = formatDiagnosticsWithSource(diagnostics, sourceText);
  if (lines.length > 0) process.stderr.write(`${lines.join('\n')}\n`);
}
