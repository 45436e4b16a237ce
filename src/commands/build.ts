/** `lineledger build [DIR]`: every session of a folder into a static site. */
import type { Command } from 'commander';
import { buildSite } from '../build.js';
import { PROGRAM_VERSION } from '../version.js';
import {
  CommandFailure,
  EXIT_OK,
  EXIT_PROBLEMS,
  loadCatalogFor,
  loadConfig,
  printDiagnostics,
  readTextOrUndefined,
} from './common.js';

interface BuildFlags {
  out?: string;
  title?: string;
  config?: string;
  quiet?: boolean;
}

async function build(dirArg: string | undefined, opts: BuildFlags): Promise<number> {
  const config = loadConfig(opts.config);
  const dir = dirArg ?? config.sessionsDir;
  if (!dir)
    throw new CommandFailure(
      'name the folder of sessions (lineledger build DIR), or set sessions: in lineledger.yaml',
    );
  const out = opts.out ?? config.outDir ?? 'site';
  const catalog = loadCatalogFor(config);
  const report = await buildSite(
    {
      inputDir: dir,
      outDir: out,
      settings: {
        title: opts.title ?? config.title,
        owner: config.owner,
        introMarkdown: config.introMarkdown,
      },
      instrumentDefaults: config.defaultInstrument,
      programVersion: PROGRAM_VERSION,
      sourceDateEpoch: process.env.SOURCE_DATE_EPOCH,
    },
    catalog,
  ).catch((e: Error) => {
    throw new CommandFailure(`build failed: ${e.message}`);
  });
  for (const o of report.outcomes) {
    const text = readTextOrUndefined(o.file);
    if (!o.ok) printDiagnostics(o.diagnostics, text);
    else if (!opts.quiet) printDiagnostics(o.warnings, text);
  }
  const built = report.outcomes.length - report.failed;
  if (!opts.quiet || report.failed > 0) {
    process.stderr.write(
      `lineledger: built ${built} of ${report.outcomes.length} sessions into ${out}${report.failed ? `; ${report.failed} failed` : ''}\n`,
    );
  }
  return report.failed > 0 ? EXIT_PROBLEMS : EXIT_OK;
}

export function registerBuild(program: Command, done: (code: number) => void): void {
  program
    .command('build')
    .description('build every session of a folder into a static site')
    .argument('[dir]', 'folder of session YAML files (default: sessions: in lineledger.yaml)')
    .option('--out <dir>', 'output folder (default: out: in lineledger.yaml, else site)')
    .option('--title <text>', "archive title (default: the config's title)")
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .option('-q, --quiet', 'print only problems')
    .action(async (dir: string | undefined, opts: BuildFlags) => done(await build(dir, opts)));
}
