/**
 * A NIST ASD "lines" form export (tab-delimited, CSV, or the fixed-width ASCII table) → rows in
 * the catalog's TSV format (src/lines/parse.ts). Pure: the export's text comes in; the TSV text,
 * the rows and the problems (as Diagnostic values with file:line:col) go out. docs/catalog.md
 * describes the rules.
 */
import { NM_PER_ANGSTROM, NM_PER_MICROMETRE } from '../constants.js';
import type { Diagnostic, Outcome } from '../diagnostics.js';
import { airToVacuum, vacuumToAir } from '../reduce/airVacuum.js';
import { asciiTableRows, isAsciiTable, splitAt, type TableRow } from './nistAscii.js';
import { CATALOG_COLUMNS, parseCatalog } from './parse.js';

export type ExportMedium = 'air' | 'vacuum';

export interface NistImportOptions {
  /** Keep only this spectrum ("Fe I"); null: every spectrum, named from element + sp_num. */
  species: string | null;
  /** The medium of wavelength columns whose names do not say (`obs_wl(nm)`); null: must say. */
  medium: ExportMedium | null;
  sourceKey: string;
}

export interface ImportedRow {
  species: string;
  vacuum_nm: number;
  /** null below 200 nm (written `-`). */
  air_nm: number | null;
  unc_nm: number;
  intensity: number;
  flags: string[];
  /** Which wavelength was used: observed or Ritz (computed from the energy levels). */
  basis: 'observed' | 'ritz';
  /** Whether the export gave a number for the intensity (else it is written 1, ranking last). */
  intensity_stated: boolean;
  /** The transition probability Aki (1/s) if the export gives one. */
  aki_per_s: number | null;
  /** The row's Ritz wavelength (vacuum, nm), if it has one: tells a blend's components apart. */
  ritz_vacuum_nm: number | null;
  /** Line of the export the row came from. */
  line: number;
  /** Decimals (in nm) the row is written with: the source's precision, at least 4. */
  decimals: number;
}

export interface NistImport {
  rows: ImportedRow[];
  /** The rows in the catalog's TSV format, with a header comment saying where they came from. */
  tsv: string;
}

/**
 * Intensity descriptors carried into catalog flags (ASD's legend of Rel. Int. codes; the words
 * are the catalog's, docs/catalog.md). The others are dropped with a warning.
 */
export const FLAG_FOR_DESCRIPTOR: Readonly<Record<string, string>> = {
  P: 'persistent',
  bl: 'blend',
  f: 'forbidden',
  b: 'band-head',
  d: 'diffuse',
  h: 'hazy',
  H: 'very-hazy',
  w: 'wide',
  r: 'self-reversed',
  '?': 'questionable',
  '*': 'shared-intensity',
  c: 'complex',
  D: 'double',
  l: 'shaded-red',
  s: 'shaded-violet',
  m: 'masked',
  p: 'perturbed',
  q: 'asymmetric',
  u: 'unresolved',
  i: 'uncertain-identification',
  t: 'tentative-classification',
  a: 'absorption',
  hfs: 'hyperfine-structure',
};

/** ASD `Type` column values of forbidden transitions (magnetic dipole, electric quadrupole, …). */
const FORBIDDEN_TYPES = new Set(['M1', 'E2', 'M2', 'E3', 'M3', 'M1+E2', 'HF']);

/** Descriptors of ASD intensities, longest first so "bl", "aff" and "hfs" win over "b", "a", "h". */
const DESCRIPTORS = ['hfs', 'aff', 'bl', ...'*:-?abBcdDEfgGHhijlmpPqrstuwx'];

const ROMAN: readonly [number, string][] = [
  [1000, 'M'],
  [900, 'CM'],
  [500, 'D'],
  [400, 'CD'],
  [100, 'C'],
  [90, 'XC'],
  [50, 'L'],
  [40, 'XL'],
  [10, 'X'],
  [9, 'IX'],
  [5, 'V'],
  [4, 'IV'],
  [1, 'I'],
];

/** Spectrum number → spectroscopic notation: 1 → I (neutral), 2 → II (singly ionised). */
export function romanNumeral(n: number): string {
  let rest = n;
  let out = '';
  for (const [value, letters] of ROMAN) {
    while (rest >= value) {
      out += letters;
      rest -= value;
    }
  }
  return out;
}

/** A cell as ASD writes it: `="656.279"` (kept text for spreadsheets), `"1000P"`, or bare. */
export function cleanCell(raw: string): string {
  let s = raw.trim();
  // Repeat: a CSV cell may wrap the spreadsheet form once more, "=""656.279""".
  for (let pass = 0; pass < 3; pass++) {
    const before = s;
    if (s.startsWith('=')) s = s.slice(1).trim();
    if (s.length >= 2 && s.startsWith('"') && s.endsWith('"')) s = s.slice(1, -1).replace(/""/g, '"').trim();
    if (s === before) break;
  }
  return s;
}

/** Split one CSV record, honouring double quotes (a quoted cell may hold commas). */
function splitCsv(text: string): { cells: string[]; starts: number[] } {
  const cells: string[] = [];
  const starts: number[] = [];
  let cell = '';
  let start = 0;
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i] as string;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        cell += '""';
        i++;
      } else if (ch === '"') {
        quoted = false;
        cell += ch;
      } else cell += ch;
    } else if (ch === '"') {
      quoted = true;
      cell += ch;
    } else if (ch === ',') {
      cells.push(cell);
      starts.push(start);
      cell = '';
      start = i + 1;
    } else cell += ch;
  }
  cells.push(cell);
  starts.push(start);
  return { cells, starts };
}

const splitTabs = (text: string) => splitAt(text, '\t');

/** Tab-delimited or CSV text (whichever the first line uses) → rows of cells. */
function delimitedRows(lines: readonly string[]): TableRow[] {
  const firstLine = lines.find((l) => l.trim() !== '') ?? '';
  const split = firstLine.includes('\t') ? splitTabs : splitCsv;
  const out: TableRow[] = [];
  lines.forEach((raw, i) => {
    if (raw.trim() !== '') out.push({ line: i + 1, ...split(raw) });
  });
  return out;
}

function ritzVacuum(r: { w: WavelengthColumn; value: number }, fallback: ExportMedium | null): number {
  const nm = r.value * r.w.nm_per_unit;
  return (r.w.medium ?? fallback) === 'air' ? airToVacuum(nm) : nm;
}

interface WavelengthColumn {
  index: number;
  medium: ExportMedium | null;
  nm_per_unit: number;
  /** Column of its uncertainty, or -1. */
  unc: number;
}

interface Columns {
  observed: WavelengthColumn | null;
  ritz: WavelengthColumn | null;
  intensity: number;
  aki: number;
  element: number;
  spNum: number;
  type: number;
}

const UNIT_NM: Readonly<Record<string, number>> = {
  nm: 1,
  a: NM_PER_ANGSTROM,
  å: NM_PER_ANGSTROM,
  angstrom: NM_PER_ANGSTROM,
  um: NM_PER_MICROMETRE,
  µm: NM_PER_MICROMETRE,
  μm: NM_PER_MICROMETRE,
  micron: NM_PER_MICROMETRE,
};

/** `obs_wl_air(nm)`, `ritz_wl_vac(A)`, `obs_wl(nm)` → which wavelength, medium and unit. */
function wavelengthHeader(
  name: string,
): { kind: 'obs' | 'ritz'; medium: ExportMedium | null; unit: string } | null {
  const m = /^(obs|ritz)_wl(?:_(air|vac))?\((.+)\)$/i.exec(name);
  if (!m) return null;
  const medium = m[2] === undefined ? null : m[2].toLowerCase() === 'air' ? 'air' : 'vacuum';
  return {
    kind: (m[1] as string).toLowerCase() as 'obs' | 'ritz',
    medium,
    unit: (m[3] as string).toLowerCase(),
  };
}

function readHeader(names: readonly string[]): Columns | null {
  const find = (n: string) => names.findIndex((x) => x.toLowerCase() === n);
  let observed: WavelengthColumn | null = null;
  let ritz: WavelengthColumn | null = null;
  names.forEach((name, index) => {
    const h = wavelengthHeader(name);
    if (!h) return;
    const column: WavelengthColumn = {
      index,
      medium: h.medium,
      nm_per_unit: UNIT_NM[h.unit] ?? Number.NaN,
      unc: find(h.kind === 'obs' ? 'unc_obs_wl' : 'unc_ritz_wl'),
    };
    if (h.kind === 'obs') observed ??= column;
    else ritz ??= column;
  });
  if (observed === null && ritz === null) return null;
  return {
    observed,
    ritz,
    intensity: find('intens'),
    aki: names.findIndex((x) => /^aki\b/i.test(x)),
    element: find('element'),
    spNum: find('sp_num'),
    type: find('type'),
  };
}

/** Number of decimals written, so a computed medium keeps the source's precision. */
function decimals(text: string): number {
  const dot = text.indexOf('.');
  return dot < 0 ? 0 : text.length - dot - 1;
}

/** A plain positive decimal (never exponent notation, which the catalog parser refuses). */
function decimal(x: number, digits: number): string {
  return x.toFixed(Math.min(Math.max(digits, 0), 10));
}

export interface ParsedIntensity {
  value: number | null;
  flags: string[];
  dropped: string[];
}

/**
 * "1000P" → 1000 + persistent; "500bl" → blend; "(30)" → 30; "70*" → 70 (shared intensity,
 * dropped); "bl" alone → no value. Descriptors we cannot carry into a catalog flag are returned
 * in `dropped` so the caller can say so.
 */
export function parseIntensity(text: string): ParsedIntensity {
  // "bl(Fe I)", "blFe II*", "aff(Fe I)": blended with / affected by a line of another spectrum;
  // the spectrum's name goes (the flag stays). Commas separate descriptors ("d,bl").
  const cell = text
    .replace(/(bl|aff)(?:\(([^)]*)\)|[A-Z][a-z](?:\s+[IVX]+)?|[A-Z]\s+[IVX]+)/g, '$1')
    .replace(/[()[\],]/g, '')
    .trim();
  const m = /^(\d+(?:\.\d+)?)?(.*)$/.exec(cell);
  const number = m?.[1];
  let rest = (m?.[2] ?? '').replace(/\s+/g, '');
  const flags: string[] = [];
  const dropped: string[] = [];
  while (rest.length > 0) {
    const d = DESCRIPTORS.find((x) => rest.startsWith(x));
    const token = d ?? rest.slice(0, 1);
    rest = rest.slice(token.length);
    const flag = FLAG_FOR_DESCRIPTOR[token];
    if (flag) {
      if (!flags.includes(flag)) flags.push(flag);
    } else if (!dropped.includes(token)) dropped.push(token);
  }
  const value = number === undefined ? null : Number(number);
  return { value: value !== null && value > 0 ? value : null, flags, dropped };
}

function positive(text: string): number | null {
  if (!/^\d+(\.\d*)?$|^\.\d+$/.test(text)) return null;
  const v = Number(text);
  return v > 0 ? v : null;
}

export function convertNistExport(
  text: string,
  file: string,
  options: NistImportOptions,
): Outcome<NistImport> {
  const diagnostics: Diagnostic[] = [];
  const warnings: Diagnostic[] = [];
  const say = (to: Diagnostic[], line: number, col: number, field: string, message: string, hint?: string) =>
    to.push({
      file,
      line,
      col,
      severity: to === diagnostics ? 'error' : 'warning',
      code: 'nist-import',
      field,
      message,
      ...(hint ? { hint } : {}),
    });

  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const ascii = isAsciiTable(lines);
  let columns: Columns | null = null;
  const rows: ImportedRow[] = [];
  const droppedSeen = new Map<string, number>();
  const spectraSeen = new Set<string>();
  let headerSeen = false;
  let labelledByExport = false;
  if (options.species !== null && !SPECTRUM_NAME.test(options.species)) {
    say(
      diagnostics,
      1,
      1,
      '--species',
      `"${options.species.slice(0, 40)}" is not a spectrum name`,
      'give the element and ion stage in spectroscopic notation, e.g. "Fe I" or "O III"',
    );
    return { ok: false, diagnostics };
  }

  for (const { line: lineNo, cells: rawCells, starts } of ascii
    ? asciiTableRows(lines)
    : delimitedRows(lines)) {
    const cells = rawCells.map(cleanCell);
    const col = (k: number) => (starts[k] ?? 0) + 1;
    const header = readHeader(cells);
    // ASD repeats its header row where a table section starts (e.g. where the listing
    // switches from vacuum to air wavelengths at 200 nm): every header row resets the columns.
    if (header) {
      headerSeen = true;
      columns = header;
      for (const w of [header.observed, header.ritz]) {
        if (!w) continue;
        if (Number.isNaN(w.nm_per_unit))
          say(
            diagnostics,
            lineNo,
            col(w.index),
            cells[w.index] ?? '',
            'unknown wavelength unit',
            'export in nm, Å or µm',
          );
        if (w.medium === null && options.medium === null)
          say(
            diagnostics,
            lineNo,
            col(w.index),
            cells[w.index] ?? '',
            'the column does not say whether its wavelengths are in air or vacuum',
            'give --medium air or --medium vacuum',
          );
        if (w.medium !== null && options.medium !== null && w.medium !== options.medium)
          say(
            diagnostics,
            lineNo,
            col(w.index),
            cells[w.index] ?? '',
            `the column holds ${w.medium} wavelengths but --medium says ${options.medium}`,
            'leave --medium out; the column names decide',
          );
      }
      continue;
    }
    const c = columns as Columns | null;
    if (c === null) continue; // text above the first header (titles, notes)

    let species = options.species;
    if (c.element >= 0 && c.spNum >= 0) {
      const element = cells[c.element] ?? '';
      const sp = Number(cells[c.spNum]);
      if (element === '' || !Number.isInteger(sp) || sp < 1) {
        say(warnings, lineNo, col(c.element), 'element', 'row without a usable element/sp_num; skipped');
        continue;
      }
      const own = `${element} ${romanNumeral(sp)}`;
      labelledByExport = true;
      spectraSeen.add(own);
      if (species !== null && own !== species) continue;
      species = own;
    }
    if (species === null) {
      say(
        diagnostics,
        lineNo,
        1,
        '--species',
        'the export has no element/sp_num columns',
        'give --species, e.g. "Fe I"',
      );
      columns = null;
      continue;
    }

    const pick = (w: WavelengthColumn | null) => {
      if (!w) return null;
      // Brackets and a trailing "?" or "+" mark questionable or shifted values; the number stands.
      const t = (cells[w.index] ?? '').replace(/^[[(]|[\])]$|[+?]$/g, '');
      const v = positive(t);
      return v === null ? null : { w, text: t, value: v };
    };
    // Observed before Ritz: the observed wavelength is what a lamp shows, with the stated
    // measurement uncertainty; the Ritz value fills in lines only computed from level energies.
    const obs = pick(c.observed);
    const ritz = pick(c.ritz);
    const chosen = obs ?? ritz;
    if (!chosen) {
      say(warnings, lineNo, 1, 'wavelength', 'row without an observed or Ritz wavelength; skipped');
      continue;
    }
    const medium = chosen.w.medium ?? (options.medium as ExportMedium);
    const value_nm = chosen.value * chosen.w.nm_per_unit;
    const places = Math.max(0, decimals(chosen.text) + Math.round(Math.log10(chosen.w.nm_per_unit)) * -1);
    const vacuum_nm = medium === 'air' ? airToVacuum(value_nm) : value_nm;
    const air_nm = vacuum_nm < 200 ? null : medium === 'air' ? value_nm : vacuumToAir(value_nm);

    const uncText = chosen.w.unc >= 0 ? (cells[chosen.w.unc] ?? '') : '';
    const unc = positive(uncText);
    // No stated uncertainty: one unit of the last decimal written, the least it can be.
    const unc_nm = unc !== null ? unc * chosen.w.nm_per_unit : 10 ** -places;

    const intensityText = c.intensity >= 0 ? (cells[c.intensity] ?? '') : '';
    const parsed = parseIntensity(intensityText);
    let intensity = parsed.value;
    const intensity_stated = intensity !== null;
    const akiText = c.aki >= 0 ? (cells[c.aki] ?? '') : '';
    const aki = /^\d+(\.\d*)?(e[+-]?\d+)?$/i.test(akiText) ? Number(akiText) : null;
    if (intensity === null) {
      say(
        warnings,
        lineNo,
        c.intensity >= 0 ? col(c.intensity) : 1,
        'intens',
        `no usable intensity ("${intensityText}"); written as 1`,
        'intensities only rank lines within a species; 1 puts it last',
      );
      intensity = 1;
    }
    const flags = [...parsed.flags];
    const type = c.type >= 0 ? (cells[c.type] ?? '') : '';
    if (FORBIDDEN_TYPES.has(type) && !flags.includes('forbidden')) flags.push('forbidden');
    for (const d of parsed.dropped) droppedSeen.set(d, (droppedSeen.get(d) ?? 0) + 1);

    rows.push({
      species,
      vacuum_nm,
      air_nm,
      unc_nm,
      intensity,
      flags,
      basis: obs ? 'observed' : 'ritz',
      intensity_stated,
      aki_per_s: aki !== null && aki > 0 ? aki : null,
      ritz_vacuum_nm: ritz === null ? null : ritzVacuum(ritz, options.medium),
      line: lineNo,
      decimals: Math.max(places, 4),
    });
  }

  if (!headerSeen)
    say(
      diagnostics,
      1,
      1,
      'header',
      'no header row with obs_wl_… or ritz_wl_… columns found',
      'export from the ASD lines form as tab-delimited, CSV or ASCII text',
    );
  if (options.species !== null && spectraSeen.size > 0 && !spectraSeen.has(options.species))
    say(
      diagnostics,
      1,
      1,
      '--species',
      `the export has no lines of "${options.species}"`,
      `it has ${[...spectraSeen].sort().join(', ')}`,
    );
  if (diagnostics.length > 0) return { ok: false, diagnostics };
  if (rows.length === 0) {
    say(diagnostics, 1, 1, 'rows', 'the export holds no usable lines');
    return { ok: false, diagnostics };
  }

  const merged = mergeDuplicates(rows, (r, kept, components) =>
    say(
      warnings,
      r.line,
      1,
      'wavelength',
      components
        ? `same observed ${r.species} wavelength as line ${kept.line}, another Ritz value (a blend resolved into components); kept once, flagged blend`
        : `same ${r.species} wavelength as line ${kept.line} (a multiply classified line); kept once`,
    ),
  );
  for (const [d, n] of [...droppedSeen].sort()) {
    say(
      warnings,
      1,
      1,
      'intens',
      `intensity descriptor "${d}" on ${n} row${n === 1 ? '' : 's'} has no catalog flag; dropped`,
      'see docs/catalog.md',
    );
  }
  const tsv = writeTsv(merged, file, options.sourceKey, ascii ? 'ASCII table' : 'delimited text');
  // What we write must load: the catalog loader's own rules are the check, not a second copy.
  const check = parseCatalog({
    version: 'import-nist',
    lineFiles: [{ name: 'converted.tsv', text: tsv }],
    sourceFiles: [
      { name: 'sources.yaml', text: `${JSON.stringify(options.sourceKey)}:\n  citation: check\n` },
    ],
    groupsYaml: null,
  });
  if (!check.ok) {
    for (const d of check.diagnostics)
      say(diagnostics, 1, 1, d.field, `the converted rows would not load: ${d.message}`, d.hint);
    return { ok: false, diagnostics };
  }
  if (!labelledByExport)
    say(
      warnings,
      1,
      1,
      '--species',
      `the export does not name its spectrum: every row is labelled "${options.species}" as --species says`,
      'check that the export is of that spectrum',
    );
  return { ok: true, value: { rows: merged, tsv }, warnings };
}

/** Spectroscopic notation of an atomic spectrum: element symbol and ion stage ("Fe I", "O III"). */
const SPECTRUM_NAME = /^[A-Z][a-z]? [IVXLC]+$/;

/**
 * Same species and wavelength more than once: ASD lists a line once per classification, and an
 * observed blend once per component (each with its own Ritz wavelength, all sharing the one
 * observed wavelength). Kept once, with the highest intensity and the union of flags; when the
 * rows' Ritz wavelengths differ, the line is a blend of those components and is flagged so.
 */
function mergeDuplicates(
  rows: ImportedRow[],
  warn: (row: ImportedRow, kept: ImportedRow, components: boolean) => void,
): ImportedRow[] {
  const sorted = [...rows].sort((a, b) => a.species.localeCompare(b.species) || a.vacuum_nm - b.vacuum_nm);
  const out: ImportedRow[] = [];
  for (const r of sorted) {
    const last = out[out.length - 1];
    const digits = Math.min(r.decimals, last?.decimals ?? r.decimals);
    if (
      last &&
      last.species === r.species &&
      decimal(last.vacuum_nm, digits) === decimal(r.vacuum_nm, digits)
    ) {
      const components =
        r.basis === 'observed' &&
        last.ritz_vacuum_nm !== null &&
        r.ritz_vacuum_nm !== null &&
        decimal(last.ritz_vacuum_nm, digits) !== decimal(r.ritz_vacuum_nm, digits);
      warn(r, last, components);
      last.intensity = Math.max(last.intensity, r.intensity);
      last.intensity_stated ||= r.intensity_stated;
      if (r.aki_per_s !== null) last.aki_per_s = Math.max(last.aki_per_s ?? 0, r.aki_per_s);
      for (const f of r.flags) if (!last.flags.includes(f)) last.flags.push(f);
      if (components && !last.flags.includes('blend')) last.flags.push('blend');
      continue;
    }
    out.push({ ...r, flags: [...r.flags] });
  }
  return out;
}

function writeTsv(rows: readonly ImportedRow[], file: string, sourceKey: string, format: string): string {
  const name = file.split(/[\\/]/).pop() ?? file;
  const ritz = rows.filter((r) => r.basis === 'ritz').length;
  const out = [
    `# Converted by lineledger import-nist from ${name} (a NIST ASD lines-form export, ${format}): ${rows.length} lines,`,
    `# ${rows.length - ritz} observed and ${ritz} Ritz wavelengths (observed preferred). The medium not in the export is`,
    '# COMPUTED with the IAU formula (Morton 2000, ApJS 130, 403); air_nm is "-" below 200 nm.',
    CATALOG_COLUMNS.join('\t'),
  ];
  for (const r of rows) out.push(catalogRow(r, sourceKey));
  return `${out.join('\n')}\n`;
}

/** One imported row as a catalog TSV line (origin `read`), with the source's precision. */
export function catalogRow(r: ImportedRow, sourceKey: string): string {
  const digits = r.decimals;
  const unc = decimal(r.unc_nm, Math.max(digits, 6)).replace(/0+$/, '').replace(/\.$/, '');
  return [
    r.species,
    decimal(r.vacuum_nm, digits),
    r.air_nm === null ? '-' : decimal(r.air_nm, digits),
    Number(unc) > 0 ? unc : '0',
    String(r.intensity),
    r.flags.length > 0 ? r.flags.join(',') : '-',
    sourceKey,
    'read',
  ].join('\t');
}
