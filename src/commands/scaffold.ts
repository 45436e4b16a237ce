/**
 * `lineledger new FILE --method M [--force]`: write a session template to fill in. The one
 * place the wall clock is right: the template's date is the day the user creates the file.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Command, Option } from 'commander';
import { safeIdFromFileName } from '../session/read.js';
import { schemaReference, sessionTemplate, TEMPLATE_KINDS, type TemplateKind } from '../session/scaffold.js';
import { checkFileTarget } from '../write/guard.js';
import { CommandFailure, EXIT_OK, EXIT_PROBLEMS } from './common.js';

/** The package's own folder (this file is dist/commands/scaffold.js or src/commands/scaffold.ts). */
function packageRoot(): string {
  return resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
}

/** Today's date in the user's own time zone: the day they create the file. */
function localDate(now: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

function scaffold(file: string, opts: { method: TemplateKind; force?: boolean }): number {
  if (!/\.ya?ml$/i.test(file))
    throw new CommandFailure(`${file}: a session file name must end in .yaml (the build reads only those)`);
  const target = resolve(file);
  if (existsSync(target) && !opts.force)
    throw new CommandFailure(
      `${file} already exists; choose another name, or add --force to replace it`,
      EXIT_PROBLEMS,
    );
  // --force replaces a session file, never a folder or what a link points to.
  const refused = opts.force ? checkFileTarget(file, [], true) : null;
  if (refused) throw new CommandFailure(refused);
  const root = packageRoot();
  const text = sessionTemplate({
    method: opts.method,
    date: localDate(new Date()),
    id: safeIdFromFileName(file),
    schemaRef: schemaReference(dirname(target), root, join(root, 'schema', 'session-1.schema.json')),
  });
  try {
    mkdirSync(dirname(target), { recursive: true });
    writeFileSync(target, text, { flag: opts.force ? 'w' : 'wx' });
  } catch (e) {
    throw new CommandFailure(`cannot write ${file}: ${(e as Error).message}`);
  }
  process.stderr.write(
    `lineledger: wrote ${file} (method ${opts.method}); fill in every ~ marked FILL IN, then run: lineledger vet ${file}\n`,
  );
  return EXIT_OK;
}

export function registerScaffold(program: Command, done: (code: number) => void): void {
  program
    .command('new')
    .description('write a new session file to fill in, for one measurement method')
    .argument('<file>', 'the session file to create (ends in .yaml)')
    .addOption(
      new Option(
        '--method <method>',
        'how the line positions are read (profile: a recorded profile whose lines are found)',
      )
        .choices([...TEMPLATE_KINDS])
        .makeOptionMandatory(),
    )
    .option('--force', 'replace the file if it exists')
    .action((file: string, opts: { method: TemplateKind; force?: boolean }) => done(scaffold(file, opts)));
}
