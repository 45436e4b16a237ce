/**
 * Identification speed (part of npm run bench): one 30-line session against the full catalog
 * with mixtures, a redshift scan over [0, 1], and both again against a synthetic catalog ten
 * times larger (each species' lines repeated with small offsets) to see how they grow.
 */

import { readCatalogInput } from '../src/lines/load.js';
import { parseCatalog } from '../src/lines/parse.js';
import type { Catalog } from '../src/lines/types.js';
import { runSession } from '../src/pipeline.js';
import { gauss, makeSession, rng } from './synthetic.js';

function biggerCatalog(times: number): Catalog {
  const input = readCatalogInput();
  const lineFiles = input.lineFiles.map((f) => {
    const out: string[] = [];
    for (const row of f.text.split('\n')) {
      if (row.startsWith('#') || row.startsWith('species\t') || row.trim() === '') {
        out.push(row);
        continue;
      }
      const cells = row.split('\t');
      for (let k = 0; k < times; k++) {
        const c = [...cells];
        // Copies spread ±5 nm around the original; air left as '-' so no air/vacuum check applies.
        const shift = k === 0 ? 0 : ((k * 7919) % 1000) / 100 - 5;
        c[1] = (Number(c[1]) + shift).toFixed(4);
        c[2] = '-';
        out.push(c.join('\t'));
      }
    }
    return { name: f.name, text: out.join('\n') };
  });
  const parsed = parseCatalog({
    ...input,
    lineFiles: lineFiles.map((f) => ({ ...f, text: sortRows(f.text) })),
  });
  if (!parsed.ok) throw new Error(`synthetic catalog: ${JSON.stringify(parsed.diagnostics[0])}`);
  return parsed.value;
}

function sortRows(text: string): string {
  return text; // parseCatalog sorts per species itself
}

function timeIt(label: string, fn: () => void, runs: number): number {
  fn(); // warm-up
  const t0 = performance.now();
  for (let i = 0; i < runs; i++) fn();
  const ms = (performance.now() - t0) / runs;
  console.log(`${label.padEnd(58)} ${ms.toFixed(1).padStart(8)} ms`);
  return ms;
}

const rand = rng(42);
for (const times of [1, 10]) {
  const catalog = times === 1 ? biggerCatalog(1) : biggerCatalog(times);
  const rows = [...catalog.species.values()].reduce((a, s) => a + s.vacuum_nm.length, 0);
  console.log(`\ncatalog × ${times}: ${catalog.species.size} species, ${rows} lines`);
  // 30 lines: three gases' strongest lines plus a few strays, σ 0.3 nm, all species considered.
  const lines: string[] = [];
  for (const s of ['Ne I', 'Ar I', 'Hg I']) {
    const sp = catalog.species.get(s);
    if (!sp) continue;
    const idx = [...sp.intensity.keys()].sort(
      (a, b) => (sp.intensity[b] as number) - (sp.intensity[a] as number),
    );
    for (const k of idx
      .filter((k) => (sp.vacuum_nm[k] as number) > 400 && (sp.vacuum_nm[k] as number) < 700)
      .slice(0, 9)) {
      lines.push(`  - { wavelength: ${((sp.vacuum_nm[k] as number) + 0.3 * gauss(rand)).toFixed(3)} }`);
    }
  }
  for (let i = lines.length; i < 30; i++)
    lines.push(`  - { wavelength: ${(400 + rand() * 300).toFixed(3)} }`);
  const session30 = `lineledger: 1\nsource: { kind: unknown }\nmedium: vacuum\ncandidates: { species: [${catalog.names.map((n) => JSON.stringify(n)).join(', ')}] }\ninstrument: { resolution_nm: 0.8, range_nm: [400, 700] }\nmeasurement: { sigma: 0.3 }\nlines:\n${lines.join('\n')}\n`;
  timeIt(
    `identify one 30-line session, all species, mixtures`,
    () => {
      const r = runSession('speed.yaml', session30, catalog);
      if (!r.ok) throw new Error('speed session failed');
    },
    20,
  );
  const qso = makeSession(catalog, rand, {
    species: ['H I'],
    sigma_nm: 0.5,
    range_nm: [380, 900],
    medium: 'vacuum',
    sourceKind: 'galaxy',
    z: 0.3,
    searchRange: [0, 1],
    spuriousMean: 0,
    groups: ['quasar', 'nebular'],
  });
  if (qso) {
    timeIt(
      `redshift scan over [0, 1] (${qso.lineCount} lines, quasar + nebular groups)`,
      () => {
        const r = runSession('qso.yaml', qso.yaml, catalog);
        if (!r.ok) throw new Error('scan session failed');
      },
      5,
    );
  }
}
