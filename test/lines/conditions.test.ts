/** Line strengths by condition (data/lines/conditions.tsv): the loader, the join and their errors. */
import { describe, expect, it } from 'vitest';
import { priorPenalty, sessionPriors } from '../../src/identify/priors.js';
import { CONDITION_MATCH_NM } from '../../src/lines/conditions.js';
import { type CatalogInput, parseCatalog } from '../../src/lines/parse.js';
import { runSession } from '../../src/pipeline.js';
import type { Session } from '../../src/session/types.js';
import { bundledCatalog } from '../helpers/catalog.js';

const HEADER_LINES = 'species\tvacuum_nm\tair_nm\tunc_nm\tintensity\tflags\tsource\torigin';
const HEADER_CONDITIONS = 'species\tvacuum_nm\tcondition\tstrength\tsource\torigin';

/** X I: lab says B (520 nm) > C (540 nm) > A (500 nm). Y I: three lines, no condition rows. */
const LINES = [
  HEADER_LINES,
  'X I\t500.0000\t499.8605\t0.001\t10\t-\tsrc\tmemory',
  'X I\t520.0000\t519.8548\t0.001\t100\t-\tsrc\tmemory',
  'X I\t540.0000\t539.8497\t0.001\t50\t-\tsrc\tmemory',
  'Y I\t560.0000\t559.8446\t0.001\t10\t-\tsrc\tmemory',
  'Y I\t580.0000\t579.8392\t0.001\t50\t-\tsrc\tmemory',
  'Y I\t600.0000\t599.8340\t0.001\t100\t-\tsrc\tmemory',
].join('\n');

function input(conditions: string, priors: string | null = null): CatalogInput {
  return {
    version: '0.0.0',
    lineFiles: [{ name: 'x.tsv', text: LINES }],
    sourceFiles: [{ name: 'sources.yaml', text: 'src:\n  citation: "test citation"\n' }],
    groupsYaml: null,
    priorsYaml: priors === null ? null : { name: 'priors.yaml', text: priors },
    conditionFiles: [{ name: 'conditions.tsv', text: conditions }],
  };
}

function errorsOf(conditions: string) {
  const r = parseCatalog(input(conditions));
  if (r.ok) throw new Error('expected errors');
  return r.diagnostics;
}

/** The first problem of a priors file, which must be positioned at its entry. */
function priorsProblem(priors: string) {
  const r = parseCatalog(input(HEADER_CONDITIONS, priors));
  if (r.ok) throw new Error('expected an error');
  return r.diagnostics[0];
}

describe('conditions.tsv', () => {
  it('joins each row onto the nearest catalog line of its species, NaN elsewhere', () => {
    const r = parseCatalog(
      input(
        [
          '# comment',
          HEADER_CONDITIONS,
          'X I\t500.004\tflame\t100\tsrc\tmemory',
          'X I\t520.0000\tnebular\t3\tsrc\tread',
        ].join('\n'),
      ),
    );
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    const x = r.value.species.get('X I');
    const flame = x?.strengths.get('flame');
    expect(flame && [...flame]).toEqual([100, Number.NaN, Number.NaN]);
    expect([...(x?.strengths.get('nebular') ?? [])]).toEqual([Number.NaN, 3, Number.NaN]);
    // A species the table does not name has no conditions at all.
    expect(r.value.species.get('Y I')?.strengths.size).toBe(0);
  });

  it('reports each bad row at its line and column', () => {
    const text = [
      HEADER_CONDITIONS, // line 1
      'X I\t500.0\toven\t1\tsrc\tmemory', // 2: unknown condition, column of "oven" = 11
      'X I\t500.0\tlab\t1\tsrc\tmemory', // 3: lab is the line files' column
      'X I\t500.0\tflame\t-2\tsrc\tmemory', // 4: strength not positive, column 17
      'X I\t500.0\tflame\t2\tnowhere\tmemory', // 5: unknown source, column 19
      'X I\t500.0\tflame\t2\tsrc\tguessed', // 6: bad origin, column 23
      `X I\t${(500 + 2 * CONDITION_MATCH_NM).toFixed(3)}\tflame\t2\tsrc\tmemory`, // 7: no line near
      'Z I\t500.0\tflame\t2\tsrc\tmemory', // 8: no such species
      'X I\t520.0\tflame\t2\tsrc\tmemory', // 9: fine
      'X I\t520.0\tflame\t3\tsrc\tmemory', // 10: same line twice
      'X I\t520.0\tflame', // 11: too few cells
    ].join('\n');
    const at = errorsOf(text).map((d) => `${d.file}:${d.line}:${d.col} ${d.field}`);
    expect(at).toEqual([
      'conditions.tsv:2:11 condition',
      'conditions.tsv:3:11 condition',
      'conditions.tsv:4:17 strength',
      'conditions.tsv:5:19 source',
      'conditions.tsv:6:23 origin',
      'conditions.tsv:11:1 row',
      'conditions.tsv:7:5 vacuum_nm',
      'conditions.tsv:8:1 species',
      'conditions.tsv:10:5 vacuum_nm',
    ]);
    const lab = errorsOf(text).find((d) => d.line === 3);
    expect(lab?.message).toMatch(/intensity column/);
  });

  it('rejects a wrong header', () => {
    const d = errorsOf('species\tvacuum_nm\tstrength\nX I\t500\t1');
    expect(d[0]).toMatchObject({ file: 'conditions.tsv', line: 1, col: 1, field: 'header' });
  });

  it('priors.yaml: intensities must name lab or a condition, positioned', () => {
    expect(priorsProblem('kinds:\n  flame:\n    intensities: oven\n')).toMatchObject({
      file: 'priors.yaml',
      line: 3,
      field: 'kinds.flame.intensities',
    });
  });

  it('priors.yaml: a line scatter needs km_s in range, a reason and a source, positioned', () => {
    expect(priorsProblem('kinds:\n  galaxy:\n    line_scatter: { km_s: 9000, reason: r }\n')).toMatchObject({
      file: 'priors.yaml',
      line: 3,
      field: 'kinds.galaxy.line_scatter',
    });
    const good = parseCatalog(
      input(HEADER_CONDITIONS, 'kinds:\n  galaxy:\n    line_scatter: { km_s: 500, reason: r, source: s }\n'),
    );
    if (!good.ok) throw new Error(JSON.stringify(good.diagnostics));
    expect(good.value.priors.kinds.get('galaxy')?.line_scatter).toEqual({
      km_s: 500,
      reason: 'r',
      source: 's',
    });
  });

  it('priors.yaml: others needs p in (0, 1), a reason and a source; a class with it names all it expects', () => {
    expect(
      priorsProblem('classes:\n  fluorescent:\n    others: { p: 2, reason: r, source: s }\n'),
    ).toMatchObject({
      file: 'priors.yaml',
      line: 3,
      field: 'classes.fluorescent.others',
    });
    const priors =
      'kinds:\n  lamp:\n    priors:\n      - { species: Y I, p: 0.3, reason: r, source: s }\n' +
      'classes:\n  fluorescent:\n    others: { p: 0.01, reason: r, source: s }\n    priors:\n      - { species: X I, p: 0.9, reason: r, source: s }\n';
    const good = parseCatalog(input(HEADER_CONDITIONS, priors));
    if (!good.ok) throw new Error(JSON.stringify(good.diagnostics));
    const session = (cls: string | null) =>
      ({ source: { kind: 'lamp', class: cls }, lines_listed: null }) as unknown as Session;
    const closed = sessionPriors(session('fluorescent'), good.value);
    // X I is named (log odds of 0.9); Y I, named only by the kind, takes the class's others prior.
    expect(priorPenalty(closed, 'X I', 2)).toBeCloseTo(Math.log(0.1 / 0.9), 9);
    expect(priorPenalty(closed, 'Y I', 2)).toBeCloseTo(Math.log(0.99 / 0.01), 9);
    // Never kinder than the uninformed prior; without a class, the kind's entries and the uninformed prior.
    expect(priorPenalty(closed, 'Z I', 6)).toBe(6);
    const open = sessionPriors(session(null), good.value);
    expect(priorPenalty(open, 'Y I', 2)).toBeCloseTo(Math.log(0.7 / 0.3), 9);
    expect(priorPenalty(open, 'Z I', 2)).toBe(2);
  });

  it('the bundled table loads, and gives Na D in a flame the 2:1 ratio of the upper levels 2J+1', () => {
    // 3p 2P3/2 (g = 4) : 3p 2P1/2 (g = 2), optically thin (from memory; any atomic physics text).
    const na = bundledCatalog().species.get('Na I');
    const flame = na?.strengths.get('flame');
    if (!na || !flame) throw new Error('no Na I flame strengths');
    const at = (vac: number) => flame[[...na.vacuum_nm].findIndex((v) => Math.abs(v - vac) < 0.01)] as number;
    // NIST ASD vacuum wavelengths of D2 and D1 (from memory).
    expect(at(589.158) / at(589.756)).toBeCloseTo(2, 6);
  });
});

describe('a source reads the strengths of its condition', () => {
  // Lab says B > C > A; the flame table says A > C > B. A session that measures A > C > B agrees
  // with the flame table and runs against the lab: Spearman's ρ of fully agreeing (reversed) ranks
  // is +1 (−1) by its definition (Spearman 1904, Am. J. Psychol. 15, 72).
  const priors = [
    'kinds:',
    '  flame:',
    '    lab_intensities: distrust',
    '    intensities: flame',
    '  lamp:',
    '    lab_intensities: trust',
  ].join('\n');
  const conditions = [
    HEADER_CONDITIONS,
    'X I\t500.0000\tflame\t100\tsrc\tmemory',
    'X I\t520.0000\tflame\t10\tsrc\tmemory',
    'X I\t540.0000\tflame\t30\tsrc\tmemory',
  ].join('\n');
  const catalog = (() => {
    const r = parseCatalog(input(conditions, priors));
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    return r.value;
  })();
  const rho = (kind: string, species: string, waves: [number, number][]) => {
    const text = `lineledger: 1\nsource: { kind: ${kind} }\nmedium: vacuum\nmeasurement: { sigma: 0.05 }\nlines:\n${waves
      .map(([w, i]) => `  - { wavelength: ${w}, intensity: ${i} }`)
      .join('\n')}\n`;
    const out = runSession('t.yaml', text, catalog);
    if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
    const e = out.identification.candidates.find((c) => c.species === species);
    return e?.rank_correlation;
  };

  it('a flame session ranks X I by the flame table (ρ = +1), a lamp session by the lab column (ρ = −1)', () => {
    const lines: [number, number][] = [
      [500.0, 90],
      [520.0, 5],
      [540.0, 40],
    ];
    expect(rho('flame', 'X I', lines)).toBeCloseTo(1, 9);
    expect(rho('lamp', 'X I', lines)).toBeCloseTo(-1, 9);
  });

  it('a species the table is silent on keeps the distrusted lab column in a flame: no rank term', () => {
    const lines: [number, number][] = [
      [560.0, 5],
      [580.0, 40],
      [600.0, 90],
    ];
    expect(rho('flame', 'Y I', lines)).toBeNull();
    expect(rho('lamp', 'Y I', lines)).not.toBeNull();
  });
});
