/** lines.csv beside each record: one row per measured line, RFC 4180 quoting. */
import type { ResultJson } from './result.js';

function cell(v: string | number | null | undefined): string {
  if (v === null || v === undefined) return '';
  const s = String(v);
  const safe = /^[=+\-@\t\r]/.test(s) && typeof v === 'string' ? `'${s}` : s; // no spreadsheet formulas
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

export function linesCsv(result: ResultJson): string {
  const head = [
    'index',
    'label',
    'reading',
    'air_nm',
    'vacuum_nm',
    'sigma_nm',
    'rest_vacuum_nm',
    'intensity',
    'kind',
    'species',
    'ref_vacuum_nm',
    'residual_nm',
    'residual_km_s',
    'ref_origin',
    'alternatives',
  ];
  const rows = result.lines.map((l) =>
    [
      l.index,
      l.label,
      l.reading,
      l.air_nm,
      l.vacuum_nm,
      l.sigma_nm,
      l.rest_vacuum_nm,
      l.intensity,
      l.kind,
      l.assignment?.species ?? '',
      l.assignment?.ref_vacuum_nm ?? '',
      l.assignment?.residual_nm ?? '',
      l.assignment?.residual_km_s ?? '',
      l.assignment?.ref_origin ?? '',
      l.alternatives.map((a) => `${a.species} ${a.ref_vacuum_nm}`).join('; '),
    ]
      .map(cell)
      .join(','),
  );
  return `${[head.join(','), ...rows].join('\r\n')}\r\n`;
}
