/** `lineledger lookup WAVELENGTH`: which catalog lines lie near a wavelength, nearest first. */
import type { Command } from 'commander';
import { type LineHit, type LineQuery, queryLines, resolveSpeciesFilter } from '../lines/query.js';
import type { Catalog } from '../lines/types.js';
import { fixed } from '../report/format.js';
import { CommandFailure, EXIT_OK, EXIT_PROBLEMS, loadCatalogFor, loadConfig } from './common.js';

interface LookupFlags {
  window?: string;
  species: string[];
  group: string[];
  vacuum?: boolean;
  faint?: boolean;
  json?: boolean;
  config?: string;
}

const DEFAULT_WINDOW_NM = 1;

function positiveNumber(text: string, what: string): number {
  const v = Number(text);
  if (text.trim() === '' || !Number.isFinite(v) || v <= 0)
    throw new CommandFailure(`${what} must be a positive number of nanometres, not "${text}"`);
  return v;
}

function signed(x: number, digits: number): string {
  const s = fixed(x, digits);
  return x > 0 && s !== fixed(0, digits) ? `+${s}` : s;
}

function formatHits(query: LineQuery, hits: readonly LineHit[], nearest: LineHit | null): string {
  const unit = `${query.medium} nm`;
  const out: string[] = [];
  const head = `${fixed(query.wavelength_nm, 3)} nm (${query.medium}) ± ${fixed(query.window_nm, 3)} nm`;
  if (hits.length === 0) {
    out.push(`no catalog line within ${head}`);
    if (nearest)
      out.push(
        `nearest: ${nearest.label} ${fixed(nearest.wavelength_nm, 4)} nm (${signed(nearest.distance_nm, 3)} nm)`,
      );
    return out.join('\n');
  }
  out.push(`${hits.length} catalog line${hits.length === 1 ? '' : 's'} within ${head}, nearest first`);
  out.push('');
  const rows = hits.map((h) => [
    h.label,
    `${fixed(h.wavelength_nm, 4)}${h.air_nm === null && query.medium === 'air' ? ' vac' : ''}`,
    signed(h.distance_nm, 3),
    `${h.intensity} (${h.intensity_rank}/${h.species_lines})`,
    h.flags.length > 0 ? h.flags.join(',') : '-',
    h.source,
    h.origin,
  ]);
  const header = [
    'species',
    `wavelength (${unit})`,
    'distance',
    'intensity (rank)',
    'flags',
    'source',
    'origin',
  ];
  const widths = header.map((t, c) => Math.max(t.length, ...rows.map((r) => (r[c] as string).length)));
  const numeric = new Set([1, 2]);
  const line = (cells: readonly string[]) =>
    `  ${cells
      .map((t, c) => (numeric.has(c) ? t.padStart(widths[c] as number) : t.padEnd(widths[c] as number)))
      .join('  ')
      .trimEnd()}`;
  out.push(line(header));
  for (const r of rows) out.push(line(r));
  return out.join('\n');
}

function lookup(wavelengthArg: string, opts: LookupFlags): number {
  const wavelength_nm = positiveNumber(wavelengthArg, 'the wavelength');
  const window_nm = opts.window === undefined ? DEFAULT_WINDOW_NM : positiveNumber(opts.window, '--window');
  const config = loadConfig(opts.config);
  const catalog: Catalog = loadCatalogFor(config);
  const filter = resolveSpeciesFilter(catalog, opts.species, opts.group);
  if (!filter.ok) {
    // The names came from the command line, not a file: no position to show.
    for (const d of filter.diagnostics)
      process.stderr.write(`lineledger: ${d.field}: ${d.message}${d.hint ? ` — ${d.hint}` : ''}\n`);
    return EXIT_PROBLEMS;
  }
  const query: LineQuery = {
    wavelength_nm,
    window_nm,
    medium: opts.vacuum ? 'vacuum' : 'air',
    species: filter.value,
    faint: opts.faint === true,
  };
  const { hits, nearest } = queryLines(catalog, query);
  if (opts.json) {
    const json = {
      query,
      catalog: { version: catalog.version, sha256: catalog.sha256 },
      lines: hits,
      nearest,
    };
    process.stdout.write(`${JSON.stringify(json, null, 2)}\n`);
  } else {
    process.stdout.write(`${formatHits(query, hits, nearest)}\n`);
  }
  return EXIT_OK;
}

const collect = (value: string, previous: string[]) => [...previous, value];

export function registerLookup(program: Command, done: (code: number) => void): void {
  program
    .command('lookup')
    .description('list the catalog lines near a wavelength (air nm unless --vacuum), nearest first')
    .argument('<wavelength>', 'wavelength in nm, in air (or in vacuum with --vacuum)')
    .option('--window <nm>', `half-width of the window in nm (default ${DEFAULT_WINDOW_NM})`)
    .option('--species <name>', 'look only in this species (repeatable)', collect, [])
    .option('--group <id>', 'look only in the species of this candidate group (repeatable)', collect, [])
    .option('--vacuum', 'the wavelength and the listing are vacuum wavelengths')
    .option('--faint', 'also list faint lines (weak lines that name a leftover line, never evidence)')
    .option('--json', 'print the lines as JSON')
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .action((wavelength: string, opts: LookupFlags) => done(lookup(wavelength, opts)));
}
