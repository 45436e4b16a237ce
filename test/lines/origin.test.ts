/** Records tell the truth: each assignment's reference origin, in result.json and lines.csv. */
import { describe, expect, it } from 'vitest';
import { countOrigins, referenceOrigin } from '../../src/lines/origin.js';
import { parseCatalog } from '../../src/lines/parse.js';
import { runSession } from '../../src/pipeline.js';
import { linesCsv } from '../../src/report/csv.js';
import { buildResult } from '../../src/report/result.js';
import { bundledCatalog } from '../helpers/catalog.js';

const catalog = bundledCatalog();

function result(lines: readonly number[], kind = 'lamp') {
  const text = `lineledger: 1\nsource: { kind: ${kind} }\nlines:\n${lines.map((w) => `  - { wavelength: ${w} }`).join('\n')}\n`;
  const out = runSession('t.yaml', text, catalog);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return buildResult(out.reduction, out.identification, catalog, 'test');
}

describe('reference origins in the record', () => {
  it('marks Hg I lines (read from the NIST ASD table) read, and counts them', () => {
    // NIST ASD air wavelengths of Hg I, nm (from memory).
    const r = result([404.656, 435.833, 546.074, 576.96, 579.066]);
    const assigned = r.lines.filter((l) => l.assignment?.species === 'Hg I');
    expect(assigned.length).toBeGreaterThanOrEqual(4);
    for (const l of assigned) expect(l.assignment?.ref_origin).toBe('read');
    expect(r.reference_origins.read).toBe(r.lines.filter((l) => l.assignment).length);
    expect(r.reference_origins.memory).toBe(0);
    const csv = linesCsv(r).split('\r\n');
    const col = (csv[0] as string).split(',').indexOf('ref_origin');
    expect(col).toBeGreaterThan(0);
    expect((csv[1] as string).split(',')[col]).toBe('read');
  });

  it('marks a recalled row memory (a Na I nist-handbook row above 400 nm)', () => {
    const na = catalog.species.get('Na I');
    if (!na) throw new Error('no Na I');
    const k = [...na.vacuum_nm].findIndex((v, i) => na.origin[i] === 'memory' && v > 400);
    expect(referenceOrigin(catalog, 'Na I', na.vacuum_nm[k] as number, false, 0.5)).toBe('memory');
  });

  it('says mixed for a blend of read and recalled rows, and counts each kind', () => {
    const tsv = [
      'species\tvacuum_nm\tair_nm\tunc_nm\tintensity\tflags\tsource\torigin',
      'X I\t500.0000\t499.8605\t0.001\t10\t-\tnist-asd\tread',
      'X I\t500.2000\t500.0605\t0.001\t10\t-\tnist-asd\tmemory',
      'X I\t510.0000\t509.8577\t0.001\t10\t-\tnist-asd\tmemory',
    ].join('\n');
    const parsed = parseCatalog({
      version: '0.0.0',
      lineFiles: [{ name: 'x.tsv', text: tsv }],
      sourceFiles: [{ name: 'sources.yaml', text: 'nist-asd:\n  citation: "NIST ASD test citation"\n' }],
      groupsYaml: null,
    });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.diagnostics));
    expect(referenceOrigin(parsed.value, 'X I', 500.1, true, 0.5)).toBe('mixed');
    expect(referenceOrigin(parsed.value, 'X I', 500.01, false, 0.5)).toBe('read');
    expect(referenceOrigin(parsed.value, 'X I', 509.9, false, 0.5)).toBe('memory');
    expect(referenceOrigin(parsed.value, 'Y I', 509.9, false, 0.5)).toBeNull();
    expect(countOrigins(['read', 'memory', 'memory', null, 'computed'])).toEqual({
      read: 1,
      memory: 2,
      computed: 1,
      mixed: 0,
    });
  });
});
