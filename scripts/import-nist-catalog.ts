/**
 * Regenerates the catalog rows read from NIST ASD line tables, and the hydrogenic rows
 * (npm run catalog:nist [-- DIR] [--check]).
 *
 *   DIR      the folder of NIST ASD ASCII tables (default: ../shared/nist-asd beside the repo)
 *   --check  write nothing; exit 1 if the committed files differ from what DIR gives
 *
 * Writes data/lines/nist-asd.tsv (13 spectra, every line of 300–1000 nm at or above the
 * spectrum's intensity threshold below, converted by src/lines/nistImport.ts),
 * data/lines/hydrogenic.tsv (H I, He II from src/lines/hydrogenic.ts), the generated block of
 * data/lines/sources.yaml (one source key per table, naming its retrieval date), and takes
 * those species' rows out of data/lines/atomic.tsv (where the recalled rows were).
 * docs/catalog.md explains the thresholds; data/lines/CHANGES.md records each regeneration.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { HYDROGENIC_SPECTRA, hydrogenicLines } from '../src/lines/hydrogenic.js';
import { catalogRow, convertNistExport, type ImportedRow } from '../src/lines/nistImport.js';
import { CATALOG_COLUMNS } from '../src/lines/parse.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const args = process.argv.slice(2);
const CHECK = args.includes('--check');
/** Experiments only: --top N sets each threshold to the N-th strongest line's intensity. */
const TOP = args.includes('--top') ? Number(args[args.indexOf('--top') + 1]) : null;
const dir = resolve(
  args.find((a, i) => !a.startsWith('--') && args[i - 1] !== '--top') ??
    join(root, '..', 'shared', 'nist-asd'),
);

/** The wavelength range kept (vacuum nm): what grating spectroscopes and cameras reach. */
const RANGE_NM: [number, number] = [300, 1000];
/** Hydrogenic lines: the same, widened to keep H I P7 (1005 nm) and He II 5–4 (1012 nm). */
const HYDROGENIC_RANGE_NM: [number, number] = [300, 1015];

interface Table {
  file: string;
  species: string;
  /** The first retrieval date the file's header gives (checked against it), ISO. */
  retrieved: string;
  /** How the header writes that date, to check it. */
  header_date: string;
  /** Later additions the header names. */
  added?: string;
  /**
   * Lowest Rel. Int. kept, on the table's own scale. Chosen per spectrum so that it keeps about
   * its 40 strongest lines of 300–1000 nm (Fe I about 110, for the stellar groups): the density
   * at which the identification benchmark stays where it was with the recalled lists; denser
   * lists raise every species' chance matches (docs/catalog.md, "Thresholds"). Lines without an
   * intensity (Ritz-only lines never observed) fall below every threshold.
   */
  min_intensity: number;
  /**
   * Range kept (vacuum nm) when it differs from RANGE_NM: He I keeps its 1083 nm triplet, the
   * strongest He I line beyond 1000 nm and the one solar prominences and the chromosphere are
   * studied in (silicon cameras still reach it).
   */
  range_nm?: [number, number];
}

const TABLES: readonly Table[] = [
  {
    file: 'ArI_vacuum.txt',
    species: 'Ar I',
    retrieved: '2016-04-21',
    header_date: '21-Apr-2016',
    min_intensity: 100,
  },
  {
    file: 'ArII_vacuum.txt',
    species: 'Ar II',
    retrieved: '2018-10-03',
    header_date: '03-Oct-2018',
    min_intensity: 160,
  },
  {
    file: 'CdI_vacuum.txt',
    species: 'Cd I',
    retrieved: '2016-04-21',
    header_date: '21-Apr-2016',
    added: '2800–3000 Å added 2022-04-14',
    min_intensity: 2,
  },
  {
    file: 'CuI_vacuum.txt',
    species: 'Cu I',
    retrieved: '2016-06-13',
    header_date: '13 Jun 2016',
    min_intensity: 750,
  },
  {
    file: 'FeI_vacuum.txt',
    species: 'Fe I',
    retrieved: '2020-04-23',
    header_date: '23-Apr-2020',
    min_intensity: 140000,
  },
  {
    file: 'FeII_vacuum.txt',
    species: 'Fe II',
    retrieved: '2020-04-23',
    header_date: '23-Apr-2020',
    min_intensity: 5000,
  },
  {
    file: 'HeI_vacuum.txt',
    species: 'He I',
    retrieved: '2016-05-02',
    header_date: 'May 2, 2016',
    min_intensity: 2,
    range_nm: [300, 1100],
  },
  {
    file: 'HgI_vacuum.txt',
    species: 'Hg I',
    retrieved: '2016-04-21',
    header_date: '21-Apr-2016',
    added: '10000–12000 Å added 2017-03-26, 2800–3000 Å added 2022-04-14',
    min_intensity: 30,
  },
  {
    file: 'KrI_vacuum.txt',
    species: 'Kr I',
    retrieved: '2016-04-14',
    header_date: '14 Apr 2016',
    min_intensity: 100,
  },
  {
    file: 'NeI_vacuum.txt',
    species: 'Ne I',
    retrieved: '2016-04-21',
    header_date: '21-Apr-2016',
    min_intensity: 10000,
  },
  {
    file: 'NeII_vacuum.txt',
    species: 'Ne II',
    retrieved: '2023-06-27',
    header_date: '27-Jun-2023',
    min_intensity: 300,
  },
  {
    file: 'XeI_vacuum.txt',
    species: 'Xe I',
    retrieved: '2020-08-28',
    header_date: '28 Aug 2020',
    min_intensity: 200,
  },
  {
    file: 'ZnI_vacuum.txt',
    species: 'Zn I',
    retrieved: '2016-05-02',
    header_date: 'May 2, 2016',
    min_intensity: 2,
  },
];

const HYDROGENIC_SOURCE = 'rydberg-codata-2018';

const sourceKey = (t: Table) => `nist-asd-${t.species.toLowerCase().replace(/\s+/g, '-')}-${t.retrieved}`;

/**
 * A line the table lists as observed but without an intensity number (Fe I's self-reversed
 * resonance lines, "r" alone; Xe I 462.4 and 467.1 nm, blank) is kept when its transition
 * probability Aki is at least this: a strong transition, not a faint one. It keeps intensity 1
 * (ranks last in its species): no number is invented for it.
 */
const MIN_AKI_WITHOUT_INTENSITY_PER_S = 1e6;

const keep = (t: Table, r: ImportedRow) =>
  r.intensity_stated
    ? r.intensity >= t.min_intensity
    : r.basis === 'observed' && (r.aki_per_s ?? 0) >= MIN_AKI_WITHOUT_INTENSITY_PER_S;

/** Two kept lines of a species closer than this are one line to the catalog (its checks). */
const MIN_GAP_NM = 0.001;

/**
 * Below each spectrum's threshold, the catalog also keeps its next strongest lines, down to the
 * FAINT_LINES-th strongest line of the spectrum in range, flagged `faint`. Identification never
 * weighs a faint line as evidence for or against its species (so the chance model sees the
 * same density as before); it only assigns a measured line that nothing else explains to a
 * faint line of a species the explanation already holds (docs/identification.md, "Faint lines").
 */
const FAINT_LINES = 250;

/** Lines closer than MIN_GAP_NM merged into one, the stronger's wavelength, flagged as a blend. */
function mergeClose(rows: readonly ImportedRow[]): ImportedRow[] {
  const kept: ImportedRow[] = [];
  for (const r of rows) {
    const last = kept.at(-1);
    if (last && r.vacuum_nm - last.vacuum_nm <= MIN_GAP_NM) {
      const strong = r.intensity > last.intensity ? r : last;
      const flags = [...new Set([...last.flags, ...r.flags, 'blend'])];
      kept[kept.length - 1] = { ...strong, intensity: Math.max(r.intensity, last.intensity), flags };
      continue;
    }
    kept.push(r);
  }
  return kept;
}

function fail(message: string): never {
  process.stderr.write(`catalog:nist: ${message}\n`);
  process.exit(1);
}

interface Imported {
  table: Table & { faint_min_intensity: number };
  rows: ImportedRow[];
  /** Lines below the threshold kept as faint (flag `faint`), none within MIN_GAP_NM of a kept one. */
  faint: ImportedRow[];
  all_in_range: number;
  observed: number;
}

function importTable(table: Table): Imported {
  let t = table;
  const path = join(dir, t.file);
  if (!existsSync(path)) fail(`no ${path} (give the folder of the NIST ASD tables as an argument)`);
  const text = readFileSync(path, 'utf8');
  const head = text.split('\n').slice(0, 8).join('\n');
  if (!head.includes(t.header_date))
    fail(`${t.file}: the header does not give the retrieval date ${t.header_date}`);
  const outcome = convertNistExport(text, t.file, {
    species: t.species,
    medium: null,
    sourceKey: sourceKey(t),
  });
  if (!outcome.ok)
    fail(`${t.file}: ${outcome.diagnostics.map((d) => `${d.line}:${d.col} ${d.message}`).join('; ')}`);
  const [from_nm, to_nm] = t.range_nm ?? RANGE_NM;
  const inRange = outcome.value.rows.filter((r) => r.vacuum_nm >= from_nm && r.vacuum_nm <= to_nm);
  if (TOP !== null) {
    const sorted = inRange.map((r) => r.intensity).sort((a, b) => b - a);
    t = { ...t, min_intensity: Math.max(2, sorted[Math.min(TOP, sorted.length) - 1] ?? 2) };
  }
  // Closer than the catalog tells lines apart: one line, the stronger's wavelength, a blend.
  const kept = mergeClose(inRange.filter((x) => keep(t, x)));
  const stated = inRange
    .filter((r) => r.intensity_stated)
    .map((r) => r.intensity)
    .sort((a, b) => b - a);
  const faintMin = stated[Math.min(FAINT_LINES, stated.length) - 1] ?? Number.POSITIVE_INFINITY;
  const nearKept = (r: ImportedRow) => kept.some((k) => Math.abs(k.vacuum_nm - r.vacuum_nm) <= MIN_GAP_NM);
  const faint = mergeClose(
    inRange.filter((r) => r.intensity_stated && !keep(t, r) && r.intensity >= faintMin && !nearKept(r)),
  ).map((r) => ({ ...r, flags: [...r.flags, 'faint'] }));
  return {
    table: { ...t, faint_min_intensity: faintMin },
    rows: kept,
    faint,
    all_in_range: inRange.length,
    observed: kept.filter((r) => r.basis === 'observed').length,
  };
}

const imported = TABLES.map(importTable);
const byName = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
imported.sort((a, b) => byName(a.table.species, b.table.species));

const nistTsv = [
  '# lineledger bundled line catalog: lines READ from NIST ASD line tables (fixed-width ASCII output, vacuum).',
  '# GENERATED by scripts/import-nist-catalog.ts (npm run catalog:nist) from the tables named by each source key',
  '# in sources.yaml; do not edit by hand. Per spectrum: every line of 300-1000 nm (vacuum) with Rel. Int. at or',
  '# above the threshold below (and observed lines without an intensity whose Aki >= 1e6 /s, written as 1); the observed wavelength where the table has one, else the Ritz wavelength;',
  '# vacuum_nm as the table gives it; air_nm COMPUTED with the IAU formula (Morton 2000, ApJS 130, 403).',
  '# Rel. Int. descriptors become flags (docs/catalog.md). Intensities compare only within one spectrum.',
  ...imported.map(
    (i) =>
      `#   ${i.table.species.padEnd(6)} ${i.table.file.padEnd(16)} Rel. Int. >= ${String(i.table.min_intensity).padEnd(6)} ${String(i.rows.length).padStart(4)} of ${i.all_in_range} lines in range (${i.observed} observed, ${i.rows.length - i.observed} Ritz); faint ${String(i.faint.length).padStart(4)} more down to Rel. Int. ${i.table.faint_min_intensity}`,
  ),
  `# Faint rows (flag "faint"): the next strongest lines, down to the ${FAINT_LINES}th strongest of the spectrum in range; never weighed as evidence.`,
  CATALOG_COLUMNS.join('\t'),
  ...imported.flatMap((i) =>
    [...i.rows, ...i.faint]
      .sort((a, b) => a.vacuum_nm - b.vacuum_nm)
      .map((r) => catalogRow(r, sourceKey(i.table))),
  ),
].join('\n');

const hydrogenic = HYDROGENIC_SPECTRA.flatMap((s) => hydrogenicLines(s, ...HYDROGENIC_RANGE_NM));
const hydrogenicTsv = [
  '# lineledger bundled line catalog: hydrogenic lines (H I, He II) COMPUTED, not read: origin "computed".',
  '# GENERATED by scripts/import-nist-catalog.ts from src/lines/hydrogenic.ts; do not edit by hand.',
  '# Rydberg formula with the reduced mass and the level-averaged fine structure (order alpha^2), CODATA 2018',
  "# constants (src/constants.ts); unc_nm is half the spread of the lower level's fine-structure components.",
  '# Intensity is a ranking rule, not a measurement: 1e6 / (n_lower^3 n_upper^3). Air by the IAU formula.',
  '# Series: H I n_lower 2 (Balmer), 3 (Paschen); He II n_lower 3, 4 (Pickering), 5; n_upper up to 20; 300-1015 nm.',
  CATALOG_COLUMNS.join('\t'),
  ...hydrogenic.map((l) =>
    [
      l.species,
      l.vacuum_nm.toFixed(4),
      l.air_nm === null ? '-' : l.air_nm.toFixed(4),
      l.unc_nm.toFixed(4),
      String(l.intensity),
      '-',
      HYDROGENIC_SOURCE,
      'computed',
    ].join('\t'),
  ),
].join('\n');

// The recalled rows these files replace: every row of the 13 spectra in the hand-written files
// (Ar II's two laser lines in lighting.tsv among them), and H I / He II rows in atomic.tsv (their
// ultraviolet rows from the quasar composite, in nebular.tsv, stay).
const tableSpecies = new Set(TABLES.map((t) => t.species));
const hydrogenicSpecies = new Set(HYDROGENIC_SPECTRA.map((s) => s.species));
const handWritten = ['atomic.tsv', 'lighting.tsv', 'molecular.tsv', 'nebular.tsv'].map((name) => {
  const path = join(root, 'data', 'lines', name);
  const text = readFileSync(path, 'utf8')
    .split('\n')
    .filter((row) => {
      if (row.startsWith('#')) return true;
      const species = row.split('\t')[0] as string;
      return !(tableSpecies.has(species) || (name === 'atomic.tsv' && hydrogenicSpecies.has(species)));
    })
    .join('\n');
  return [path, text] as [string, string];
});

const BEGIN = '# --- generated by scripts/import-nist-catalog.ts: begin (do not edit by hand) ---';
const END = '# --- generated by scripts/import-nist-catalog.ts: end ---';
const yamlQuote = (s: string) => JSON.stringify(s);
const generatedSources = [
  BEGIN,
  ...TABLES.flatMap((t) => [
    `${sourceKey(t)}:`,
    `  citation: ${yamlQuote(`Kramida, A., Ralchenko, Yu., Reader, J. & NIST ASD Team, NIST Atomic Spectra Database, ${t.species} lines, vacuum wavelengths, fixed-width ASCII output retrieved ${t.retrieved}${t.added ? ` (${t.added})` : ''}, National Institute of Standards and Technology, Gaithersburg, MD, https://physics.nist.gov/asd; table ${t.file} as kept in shared/nist-asd`)}`,
    `  intensity: ${yamlQuote(`NIST ASD Rel. Int. of ${t.species}, as compiled from the primary line lists: comparable only within this spectrum (and not always across its wavelength regions); rows kept at Rel. Int. >= ${t.min_intensity}.`)}`,
  ]),
  `${HYDROGENIC_SOURCE}:`,
  `  citation: ${yamlQuote('Computed by lineledger (src/lines/hydrogenic.ts): Rydberg formula with the reduced mass and the level-averaged Dirac fine structure to order alpha^2, with the CODATA 2018 constants R-infinity, me/mp, me/m-alpha and alpha (Tiesinga, E., Mohr, P. J., Newell, D. B. & Taylor, B. N. 2021, Rev. Mod. Phys. 93, 025010)')}`,
  `  intensity: ${yamlQuote('No intensity is computed: 1e6 / (n_lower^3 n_upper^3) only ranks the lines (within a series strengths fall roughly as n_upper^-3, common practice).')}`,
  END,
].join('\n');
const sourcesPath = join(root, 'data', 'lines', 'sources.yaml');
const sourcesBefore = readFileSync(sourcesPath, 'utf8');
const at = sourcesBefore.indexOf(BEGIN);
const sourcesAfter =
  at < 0
    ? `${sourcesBefore.trimEnd()}\n${generatedSources}\n`
    : `${sourcesBefore.slice(0, at)}${generatedSources}${sourcesBefore.slice(sourcesBefore.indexOf(END) + END.length)}`;

const outputs: [string, string][] = [
  [join(root, 'data', 'lines', 'nist-asd.tsv'), `${nistTsv}\n`],
  [join(root, 'data', 'lines', 'hydrogenic.tsv'), `${hydrogenicTsv}\n`],
  ...handWritten,
  [sourcesPath, sourcesAfter],
];

for (const i of imported)
  console.log(
    `${i.table.species.padEnd(6)} Rel. Int. >= ${String(i.table.min_intensity).padEnd(6)} ${String(i.rows.length).padStart(4)} lines, faint ${String(i.faint.length).padStart(4)} (>= ${i.table.faint_min_intensity}) (of ${i.all_in_range} in ${(i.table.range_nm ?? RANGE_NM).join('–')} nm)  key ${sourceKey(i.table)}`,
  );
for (const s of HYDROGENIC_SPECTRA)
  console.log(
    `${s.species.padEnd(6)} computed ${hydrogenic.filter((l) => l.species === s.species).length} lines`,
  );
console.log(
  `read from NIST ASD: ${imported.reduce((n, i) => n + i.rows.length, 0)} rows weighed, ${imported.reduce((n, i) => n + i.faint.length, 0)} faint`,
);

if (CHECK) {
  const stale = outputs.filter(([path, text]) => !existsSync(path) || readFileSync(path, 'utf8') !== text);
  if (stale.length > 0) fail(`out of date: ${stale.map(([p]) => p).join(', ')} (run npm run catalog:nist)`);
  console.log('the committed catalog files are what the tables give');
} else {
  for (const [path, text] of outputs) writeFileSync(path, text);
  console.log(`wrote ${outputs.map(([p]) => p.slice(root.length + 1)).join(', ')}`);
}
