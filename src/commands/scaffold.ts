/**
 * `lineledger new FILE --method M [--force]`: write a session template to fill in. The one
 * place the wall clock is right: without a date at the start of the file name, the template's
 * date is the day the user creates the file.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { type Command, Option } from 'commander';
import { safeIdFromFileName } from '../session/read.js';
import {
  dateFromFileName,
  schemaReference,
  sessionTemplate,
  TEMPLATE_KINDS,
  type TemplateKind,
} from '../session/scaffold.js';
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

/** Files that mark the top of an archive or project. */
const PROJECT_MARKERS = ['.git', 'lineledger.yaml', 'package.json'];

/**
 * The project a new file belongs to: the nearest folder above it that holds a git work tree,
 * a lineledger.yaml or a package.json; else the current folder when the file is inside it;
 * else the file's own folder.
 */
function projectRootOf(dir: string): string {
  for (let d = dir; ; d = dirname(d)) {
    if (PROJECT_MARKERS.some((m) => existsSync(join(d, m)))) return d;
    if (dirname(d) === d) break;
  }
  const cwd = process.cwd();
  const rel = relative(cwd, dir);
  return rel.startsWith('..') || resolve(cwd, rel) !== dir ? dir : cwd;
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
  const schemaFile = join(root, 'schema', 'session-1.schema.json');
  const schema = schemaReference(dirname(target), projectRootOf(dirname(target)), schemaFile);
  const named = dateFromFileName(file);
  const date = named ?? localDate(new Date());
  const id = safeIdFromFileName(file);
  const text = sessionTemplate({ method: opts.method, date, id, schemaRef: schema.ref });
  try {
    mkdirSync(dirname(target), { recursive: true });
    writeFileSync(target, text, { flag: opts.force ? 'w' : 'wx' });
  } catch (e) {
    throw new CommandFailure(`cannot write ${file}: ${(e as Error).message}`);
  }
  const out = [
    `lineledger: wrote ${file} (method ${opts.method}, date ${date}${named ? ' from the file name' : ', today'}); fill in every ~ marked FILL IN, then run: lineledger vet ${file}`,
  ];
  const stem = basename(file).replace(/\.ya?ml$/i, '');
  if (id !== stem)
    out.push(
      `lineledger: the id is ${id}, not "${stem}": an id holds only lower-case letters, digits and dashes (it names the page's folder); change id: in the file to choose another`,
    );
  if (!schema.inside)
    out.push(
      `lineledger: the $schema path on the first line leads out of this project, to the lineledger program at ${root}; it works on this computer only (install lineledger in the project, npm install --save-dev lineledger, and run new again for a path that travels with it)`,
    );
  process.stderr.write(`${out.join('\n')}\n`);
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
