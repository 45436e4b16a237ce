/** One session's record page: the view model the template fills, and its charts. */

import type { Identification } from '../identify/types.js';
import type { ReferenceOrigin } from '../lines/origin.js';
import type { Catalog } from '../lines/types.js';
import type { Reduction } from '../reduce/types.js';
import type { Session } from '../session/types.js';
import { cautionsFor } from './cautions.js';
import { profileChart } from './charts/profile.js';
import { type ChartCache, renderChart } from './charts/render.js';
import { calibrationChart, residualChart, scanChart, scoreChart, spectrumChart } from './charts/specs.js';
import { display, fixed, percent, probability, speciesLabel } from './format.js';
import { markdownHtml } from './markdown.js';
import { profileCopyName } from './profileCopy.js';
import type { ResultJson } from './result.js';
import {
  EVIDENCE_SCALE,
  evidenceWords,
  foundShiftText,
  knownShiftText,
  shiftHeading,
  velocityMatters,
} from './wording.js';

/** The assignment table's mark for a reference value that was not read (explained in its caption). */
const ORIGIN_MARK: Readonly<Record<ReferenceOrigin, string>> = {
  read: '',
  memory: '†',
  mixed: '†',
  computed: '‡',
};

export interface SessionPageInput {
  session: Session;
  reduction: Reduction;
  identification: Identification;
  result: ResultJson;
  catalog: Catalog;
  /** Problems told in plain words (codes stay in the terminal). */
  warnings: string[];
  buildOptions: string;
  programVersion: string;
  /** Link record.pdf (only builds run with --pdf write one). */
  pdfLink?: boolean;
}

function instrumentText(s: Session): string {
  const parts = [s.instrument.description ?? 'not described'];
  if (s.instrument.resolution_nm !== null) parts.push(`resolution ${s.instrument.resolution_nm} nm FWHM`);
  if (s.instrument.resolving_power !== null) parts.push(`resolving power ${s.instrument.resolving_power}`);
  if (s.instrument.range_nm) parts.push(`range ${s.instrument.range_nm[0]}–${s.instrument.range_nm[1]} nm`);
  return parts.join('; ');
}

function siteText(s: Session): string | null {
  if (!s.site) return null;
  const bits = [s.site.name];
  if (s.site.lat !== null && s.site.lon !== null)
    bits.push(`${fixed(s.site.lat, 3)}°, ${fixed(s.site.lon, 3)}°`);
  if (s.site.elevation_m !== null) bits.push(`${s.site.elevation_m} m`);
  return bits.filter(Boolean).join(', ');
}

/** The recorded profile with its found lines, continuum and threshold, when the lines were found. */
async function profileBlock(
  input: SessionPageInput,
  cache: ChartCache,
): Promise<Record<string, unknown> | null> {
  const finding = input.reduction.profile;
  const spec = input.reduction.session.profile;
  if (!finding || !spec) return null;
  const data = spec.data;
  const pixel = data.axis === 'pixel';
  const unit = pixel ? 'px' : 'nm';
  const status = new Map(input.identification.lines.map((l) => [l.index, l.status]));
  const assigned = new Map(
    input.identification.lines.map((l) => [
      l.index,
      l.assignment
        ? `${speciesLabel(l.assignment.species, l.assignment.flags)}${l.status === 'tentative' ? ' (tentative)' : ''}`
        : '—',
    ]),
  );
  const absorb = finding.kind === 'absorption';
  const threshold = finding.continuum.map((c) =>
    absorb ? c * (1 - finding.threshold) : c + finding.threshold,
  );
  const noise = absorb
    ? `${fixed(100 * finding.noise, 2)} % of the continuum`
    : `${fixed(finding.noise, 3)} in the profile's intensity units`;
  // What a line needs to be counted: its height (or depth) and that as a multiple of the noise.
  const level = absorb
    ? `dip at least ${fixed(100 * finding.threshold, 2)} % below the continuum (${finding.threshold_sigma} times the noise)`
    : `rise at least ${fixed(finding.threshold, 3)} above the continuum (${finding.threshold_sigma} times the noise)`;
  const title = `The recorded profile ${spec.file} (black) with its continuum (dashed blue), the detection threshold (dotted orange, ${finding.threshold_sigma}σ) and the ${finding.lines.length} lines found, numbered as in the tables and coloured by their assignment${finding.dropped.length ? '; lines left out by profile.drop in grey' : ''}.`;
  const chart = await renderChart(
    profileChart({
      title,
      axisTitle: pixel ? 'Pixel' : `Wavelength (${input.reduction.medium} nm, as recorded)`,
      x: data.x,
      intensity: data.intensity,
      continuum: finding.continuum,
      threshold,
      lines: [
        ...finding.lines.map((l, i) => ({
          x: l.centre,
          number: i + 1,
          status: (status.get(i) ?? 'unexplained') as 'identified' | 'tentative' | 'unexplained',
        })),
        ...finding.dropped.map((l) => ({ x: l.centre, number: 0, status: 'dropped' as const })),
      ],
    }),
    cache,
  );
  const digits = pixel ? 2 : 4;
  return {
    file: spec.file,
    copy: profileCopyName(spec.file),
    sha256: spec.sha256,
    description: data.description,
    text: `${finding.lines.length} ${finding.kind} line${finding.lines.length === 1 ? '' : 's'} found; noise per point ${noise}; a line must ${level}; typical FWHM ${fixed(finding.fwhm_estimate, digits)} ${unit}.${finding.dropped.length ? ` ${finding.dropped.length} left out by profile.drop.` : ''}`,
    chart: chart.svg,
    caption: title,
    unit,
    rows: finding.lines.map((l, i) => ({
      number: i + 1,
      centre: fixed(l.centre, digits + 1),
      sigma: fixed(l.centre_sigma, digits + 1),
      fwhm: fixed(l.fwhm, digits),
      strength: absorb ? `${fixed(100 * l.amplitude, 1)} %` : fixed(100 * l.relative, 1),
      snr: fixed(l.snr, 0),
      origin: l.origin === 'added' ? 'profile.add' : 'found',
      assigned: assigned.get(i) ?? '—',
    })),
    strengthTitle: absorb ? 'Depth' : 'Relative area (%)',
  };
}

export async function sessionPageModel(
  input: SessionPageInput,
  cache: ChartCache,
): Promise<Record<string, unknown>> {
  const { session, reduction, identification: idn, result, catalog } = input;
  const medium = reduction.medium;

  const chosen = new Set(idn.explanation.species);
  const bySessionIndex = new Map(idn.lines.map((l) => [l.index, l]));
  const found = idn.shift;
  const knownShift = reduction.shift && reduction.shift.source !== 'search' ? reduction.shift : null;
  const kind = session.source.kind;
  const shift = found ? foundShiftText(found, kind) : knownShift ? knownShiftText(knownShift, kind) : null;
  const shiftTitle = found ? shiftHeading(found, kind) : knownShift ? shiftHeading(knownShift, kind) : '';
  const shifted = shift !== null;
  const restLabel = shifted ? `rest-frame ${medium}` : medium;
  const unitLabel = `${restLabel} nm`;

  // Spectrum: measured lines normalised to the strongest (or all equal), references by species.
  const maxI = Math.max(0, ...reduction.lines.map((l) => l.intensity ?? 0));
  const measured = reduction.lines.map((l) => ({
    wavelength_nm: display(l.rest_vacuum_nm, medium),
    height: maxI > 0 && l.intensity !== null ? 0.15 + 0.85 * (l.intensity / maxI) : 1,
    label: `#${l.index + 1} ${fixed(display(l.rest_vacuum_nm, medium), 3)} nm`,
    absorption: l.kind === 'absorption',
  }));
  const absorptions = measured.filter((m) => m.absorption).length;
  const drawing =
    absorptions === 0
      ? 'Measured lines (black, rising from the middle line)'
      : absorptions === measured.length
        ? 'Measured absorption lines (black, dipping down from the grey continuum at the top: the darker the line, the deeper)'
        : 'Measured lines (black): emission lines rise from the middle line, absorption lines dip down from the grey continuum at the top';
  const shownSpecies =
    idn.explanation.species.length > 0
      ? idn.explanation.species
      : idn.candidates.slice(0, 1).map((c) => c.species);
  // Every species on the page as the pages write it ([O III], C III]).
  const named = (sp: string) => idn.display[sp] ?? sp;
  const references: { wavelength_nm: number; height: number; species: string }[] = [];
  for (const sp of shownSpecies) {
    const lines = catalog.species.get(sp);
    if (!lines) continue;
    let top = 0;
    for (let k = 0; k < lines.vacuum_nm.length; k++) {
      const v = lines.vacuum_nm[k] as number;
      if (v >= idn.range_nm[0] && v <= idn.range_nm[1]) top = Math.max(top, lines.intensity[k] as number);
    }
    for (let k = 0; k < lines.vacuum_nm.length; k++) {
      const v = lines.vacuum_nm[k] as number;
      if (v < idn.range_nm[0] || v > idn.range_nm[1]) continue;
      references.push({
        wavelength_nm: display(v, medium),
        height: -(0.15 + 0.85 * ((lines.intensity[k] as number) / (top || 1))),
        species: named(sp),
      });
    }
  }
  const range: [number, number] = [display(idn.range_nm[0], medium), display(idn.range_nm[1], medium)];
  const spectrumTitle = `${drawing}, and reference lines of ${shownSpecies.map(named).join(', ') || 'no species'} (dashed, below the middle line, longer for stronger lines), ${range[0].toFixed(0)}–${range[1].toFixed(0)} ${restLabel} nm; the band shows the colour of each wavelength.`;
  const spectrum = await renderChart(
    spectrumChart({
      title: spectrumTitle,
      unitLabel,
      range_nm: range,
      measured,
      references,
      species: shownSpecies.map(named),
    }),
    cache,
  );

  const measuredByIndex = new Map(reduction.lines.map((m) => [m.index, m]));
  const residualPoints = idn.lines
    .filter((l) => l.assignment)
    .map((l) => {
      const line = measuredByIndex.get(l.index);
      return {
        wavelength_nm: display(l.assignment?.ref_vacuum_nm ?? 0, medium),
        residual_nm: l.assignment?.residual_nm ?? 0,
        sigma_nm: line?.rest_sigma_nm ?? 0,
        species: l.assignment ? named(l.assignment.species) : '',
      };
    });
  const residualTitle = `Residuals of the ${residualPoints.length} assigned lines (measured − reference) with ±1σ bars.`;
  const residuals =
    residualPoints.length > 0
      ? await renderChart(
          residualChart(residualTitle, unitLabel, residualPoints, shownSpecies.map(named)),
          cache,
        )
      : null;

  // Only species with some evidence are listed; the rest are counted (all are in result.json).
  const shownCandidates = idn.candidates.filter(
    (c) => chosen.has(c.species) || (c.matched > 0 && c.score > 0),
  );
  const othersTried = Math.max(0, idn.considered.length - shownCandidates.length);
  const top = shownCandidates.slice(0, 8);
  const scoresTitle = `Evidence scores of the ${top.length === 1 ? 'one species' : `${top.length} species`} with evidence; the species of the result in blue.`;
  const scores =
    top.length > 0
      ? await renderChart(
          scoreChart(
            scoresTitle,
            top.map((c) => ({
              species: named(c.species),
              score: Number(c.score.toFixed(3)),
              chosen: chosen.has(c.species),
            })),
          ),
          cache,
        )
      : null;

  let calibration: Record<string, unknown> | null = null;
  const cal = reduction.calibration;
  if (cal) {
    const [p0, p1] = cal.pixel_range;
    const curve = Array.from({ length: 41 }, (_, i) => {
      const p = p0 + ((p1 - p0) * i) / 40;
      const t = p - cal.pixel_origin;
      return { pixel: p, wavelength_nm: cal.coefficients.reduce((acc, c, k) => acc + c * t ** k, 0) };
    });
    const caption = `Calibration: ${cal.points.length} lines of known wavelength, degree-${cal.degree} fit (line) and residuals below; flagged outliers in orange.`;
    const chart =
      cal.points.length > 0 ? await renderChart(calibrationChart(caption, cal.points, curve), cache) : null;
    calibration = {
      description: cal.description,
      rms: fixed(cal.rms_nm, 4),
      chart: chart?.svg ?? '',
      caption,
      points: cal.points.map((p) => ({
        pixel: fixed(p.pixel, 2),
        known: fixed(p.wavelength_nm, 4),
        fitted: fixed(p.fitted_nm, 4),
        residual: fixed(p.residual_nm, 4),
        flag: p.outlier ? 'outlier (kept)' : '',
      })),
    };
  }

  const scanTitle = found
    ? `Shift scan: best explanation's score at each shift tried (z ${found.scan[0]?.z.toFixed(3)}–${found.scan.at(-1)?.z.toFixed(3)}); elsewhere the lines line up no better than chance.`
    : '';
  const scan =
    found && found.scan.length > 1
      ? await renderChart(scanChart(scanTitle, found.scan, found.z), cache)
      : null;

  const profile = await profileBlock(input, cache);

  const resultLine = new Map(result.lines.map((l) => [l.index, l]));
  const o = result.reference_origins;
  const referenceOrigins = `${o.read} read from their sources, ${o.memory} recalled (memory)${o.computed ? `, ${o.computed} computed` : ''}${o.mixed ? `, ${o.mixed} blend${o.mixed === 1 ? '' : 's'} of read and recalled rows` : ''}`;

  const usedSources = new Set<string>();
  for (const sp of idn.explanation.species)
    for (const s of catalog.species.get(sp)?.source ?? []) usedSources.add(s);
  const sources = [...usedSources].sort().map((k) => catalog.sources.get(k)?.citation ?? k);

  return {
    title: session.title,
    date: session.date,
    observer: session.observer,
    site: siteText(session),
    source: `${session.source.kind}${session.source.name ? ` — ${session.source.name}` : ''}`,
    instrument: instrumentText(session),
    medium,
    unitLabel,
    status: idn.explanation.status,
    summary: idn.explanation.summary,
    discriminators: idn.explanation.discriminators.map((d) => ({
      species: named(d.species),
      against: d.against,
      wavelength: fixed(medium === 'air' ? d.air_nm : d.vacuum_nm, 2),
    })),
    warnings: input.warnings,
    cautions: cautionsFor(session.source.kind, session.source.class),
    reduction: reduction.description,
    shift,
    lines: reduction.lines.map((l) => ({
      number: l.combined_indices.length
        ? `${l.index + 1} (with ${l.combined_indices.map((i) => i + 1).join(', ')})`
        : l.index + 1,
      label: l.label ?? '',
      reading: l.reading_text,
      air: fixed(l.air_nm, 3),
      vacuum: fixed(l.vacuum_nm, 3),
      sigma: fixed(l.sigma_nm, 3),
      intensity: l.intensity ?? '',
      kind: l.kind,
    })),
    shifted,
    restLabel,
    shiftTitle,
    showVelocity: velocityMatters(kind),
    calibration,
    profile,
    charts: {
      spectrum: spectrum.svg,
      residuals: residuals?.svg ?? null,
      scores: scores?.svg ?? null,
      scan: scan?.svg ?? null,
    },
    scanRows: found
      ? [...found.scan]
          .sort((a, b) => b.score - a.score || a.z - b.z)
          .slice(0, 8)
          .map((p) => ({ z: p.z.toFixed(5), v: fixed(p.velocity_km_s, 0), score: fixed(p.score, 2) }))
      : [],
    captions: { spectrum: spectrumTitle, residuals: residualTitle, scores: scoresTitle, scan: scanTitle },
    assignments: reduction.lines.map((l) => {
      const a = bySessionIndex.get(l.index);
      const asg = a?.assignment;
      const origin = resultLine.get(l.index)?.assignment?.ref_origin ?? null;
      return {
        origin_mark: origin === null ? '' : ORIGIN_MARK[origin],
        number: l.index + 1,
        // Tentative lines carry their probability: the species is not confirmed.
        status:
          a?.status === 'tentative' ? `tentative (${percent(a.probability)})` : (a?.status ?? 'unexplained'),
        wavelength: fixed(display(l.rest_vacuum_nm, medium), 3),
        species: asg
          ? speciesLabel(asg.species, asg.flags) +
            (asg.blend ? ' (blend)' : '') +
            // A weak line of a species found on its strong ones (docs/identification.md, "Faint lines").
            (asg.flags.includes('faint') ? ' (faint line)' : '')
          : '—',
        reference: asg ? fixed(display(asg.ref_vacuum_nm, medium), 3) : '—',
        residual_nm: asg ? fixed(asg.residual_nm, 3) : '—',
        residual_km_s: asg ? fixed(asg.residual_km_s, 1) : '—',
        alternatives:
          (a?.alternatives ?? [])
            .map(
              (x) =>
                `${named(x.species)} ${fixed(display(x.ref_vacuum_nm, medium), 2)} (${fixed(x.residual_nm, 2)})`,
            )
            .join('; ') || '—',
      };
    }),
    candidates: shownCandidates.map((c, i) => ({
      rank: i + 1,
      species: c.telluric ? `${named(c.species)} (telluric)` : named(c.species),
      chosen: chosen.has(c.species),
      inRecord: chosen.has(c.species) ? 'yes' : '',
      score: fixed(c.score, 1),
      evidence: evidenceWords(c.score),
      matched: c.matched,
      expected: c.expected,
      falseAlarm: probability(c.false_alarm),
      missing: c.missing_nm.length
        ? c.missing_nm
            .slice(0, 5)
            .map((x) => fixed(display(x, medium), 1))
            .join(', ') + (c.missing_nm.length > 5 ? ' …' : '')
        : '—',
    })),
    candidatesOthers: othersTried,
    evidenceScale: EVIDENCE_SCALE,
    confidence: idn.explanation.species.length ? percent(idn.explanation.confidence) : null,
    notesHtml: await markdownHtml(session.notes, cache),
    program: { version: input.programVersion },
    catalog: { version: catalog.version, sha256: catalog.sha256 },
    inputFile: result.input.file,
    inputSha256: result.input.sha256,
    buildOptions: input.buildOptions,
    pdfLink: input.pdfLink === true,
    sources,
    referenceOrigins,
  };
}
