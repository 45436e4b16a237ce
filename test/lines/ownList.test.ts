/**
 * End to end through the real command line: an archive's own line list, named in its
 * lineledger.yaml, takes part in identification, in the record's provenance and in `lookup`.
 * The lamp and its lines are invented for the test (a club's own measured lamp).
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { airToVacuum } from '../../src/reduce/airVacuum.js';
import { bundledCatalog } from '../helpers/catalog.js';

const CLI = join(process.cwd(), 'dist', 'cli.js');

function run(args: string[]) {
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const SPECIES = 'Club lamp X';
const CITATION =
  'Riverside Astronomy Club 2026, lamp X measured with the club grating spectroscope, logbook 3, p. 41';
/** The club's air wavelengths (nm); vacuum computed with the IAU formula as the catalog requires. */
const CLUB_AIR_NM = [452.3, 517.9, 603.1, 661.4, 690.0];
const INTENSITY = [40, 100, 60, 30, 20];

function archive(): { dir: string; config: string } {
  const dir = mkdtempSync(join(tmpdir(), 'll-own-'));
  mkdirSync(join(dir, 'sessions'));
  const rows = CLUB_AIR_NM.map(
    (air, k) =>
      `${SPECIES}\t${airToVacuum(air).toFixed(4)}\t${air.toFixed(4)}\t0.05\t${INTENSITY[k]}\t-\tclub-logbook\tread`,
  );
  writeFileSync(
    join(dir, 'club-lamp.tsv'),
    `# The club's own lamp, measured by members.\nspecies\tvacuum_nm\tair_nm\tunc_nm\tintensity\tflags\tsource\torigin\n${rows.join('\n')}\n`,
  );
  writeFileSync(
    join(dir, 'club-sources.yaml'),
    `club-logbook:\n  citation: "${CITATION}"\n  intensity: "Members' eye estimates, 0-100, brightest line = 100."\n`,
  );
  const config = join(dir, 'lineledger.yaml');
  writeFileSync(
    config,
    [
      'lineledger-project: 1',
      'title: Own list test archive',
      'sessions: sessions',
      'out: site',
      'catalogs:',
      '  - lines: club-lamp.tsv',
      '    sources: club-sources.yaml',
      '',
    ].join('\n'),
  );
  writeFileSync(
    join(dir, 'sessions', 'lamp-x.yaml'),
    [
      'lineledger: 1',
      'id: lamp-x-2026-06-01',
      'title: The club lamp again',
      'date: 2026-06-01',
      'source: { kind: lamp, name: club lamp X }',
      'instrument: { resolution_nm: 1.0, range_nm: [400, 700] }',
      'candidates:',
      '  groups: [discharge-gases]',
      `  species: [${SPECIES}]`,
      'measurement: { method: wavelength, unit: nm, sigma: 0.3 }',
      'lines:',
      '  - { wavelength: 452.4, intensity: medium }',
      '  - { wavelength: 517.8, intensity: very-strong }',
      '  - { wavelength: 603.2, intensity: strong }',
      '  - { wavelength: 661.3, intensity: weak }',
      '  - { wavelength: 690.1, intensity: weak }',
      '',
    ].join('\n'),
  );
  return { dir, config };
}

describe("an archive's own line list (lineledger.yaml catalogs:)", () => {
  const { dir, config } = archive();
  const built = run(['build', '--config', config, '--quiet']);
  const record = join(dir, 'site', 'sessions', 'lamp-x-2026-06-01');

  it('builds', () => {
    expect(built.code, built.stderr).toBe(0);
  });

  it('takes part in identification: its lines explain the session', () => {
    const result = JSON.parse(readFileSync(join(record, 'result.json'), 'utf8'));
    expect(result.explanation.species).toContain(SPECIES);
    const assigned = result.lines.map(
      (l: { assignment: { species: string } | null }) => l.assignment?.species,
    );
    expect(assigned).toEqual(CLUB_AIR_NM.map(() => SPECIES));
    expect(result.candidates.map((c: { species: string }) => c.species)).toContain('Hg I');
    // The record's catalog hash covers the own list too, so it differs from the bundled one.
    expect(result.catalog.sha256).not.toBe(bundledCatalog().sha256);
  });

  it("cites the own list's source on the record page", () => {
    const page = readFileSync(join(record, 'index.html'), 'utf8');
    expect(page).toContain(CITATION);
  });

  it('is searched by lookup, with a did-you-mean for a misspelt species', () => {
    const found = run(['lookup', '517.9', '--config', config, '--species', SPECIES, '--json']);
    expect(found.code, found.stderr).toBe(0);
    const json = JSON.parse(found.stdout);
    expect(json.lines.map((l: { species: string; source: string }) => [l.species, l.source])).toEqual([
      [SPECIES, 'club-logbook'],
    ]);
    const typo = run(['lookup', '517.9', '--config', config, '--species', 'Club lamp Y']);
    expect(typo.code).toBe(1);
    expect(typo.stderr).toContain(`did you mean "${SPECIES}"?`);
  });
});
