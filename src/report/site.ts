/**
 * The render stage: processed sessions → the site's files (paths relative to the output
 * folder, contents as strings). Pure apart from chart rendering, which is deterministic.
 */
import { type Diagnostic, formatDiagnosticLine } from '../diagnostics.js';
import type { Catalog } from '../lines/types.js';
import type { SessionOutcome } from '../pipeline.js';
import { GENERAL_CAUTION } from './cautions.js';
import { type ChartCache, renderChart } from './charts/render.js';
import { overviewChart } from './charts/specs.js';
import { linesCsv } from './csv.js';
import { percent } from './format.js';
import { renderNotes } from './notes.js';
import { buildResult } from './result.js';
import { sessionPageModel } from './sessionPage.js';
import type { Templates } from './templates.js';

export interface SiteFile {
  path: string;
  contents: string;
}

export interface SiteSettings {
  title: string;
  owner: string | null;
  introMarkdown: string;
}

export interface RenderInput {
  outcomes: { outcome: SessionOutcome; text: string }[];
  catalog: Catalog;
  templates: Templates;
  settings: SiteSettings;
  programVersion: string;
  buildOptions: string;
  /** From SOURCE_DATE_EPOCH when set; never the wall clock. */
  builtOn: string | null;
}

interface IndexRow {
  sortKey: string;
  date: string | null;
  title: string;
  file: string;
  href: string | null;
  source: string;
  explanation: string;
  confidence: string;
  status: string;
  diagnostics: string[];
}

export async function renderSite(input: RenderInput, cache: ChartCache = new Map()): Promise<SiteFile[]> {
  const { catalog, templates } = input;
  const files: SiteFile[] = [{ path: 'style.css', contents: templates.css }];
  const rows: IndexRow[] = [];
  const overview: { session: string; species: string }[] = [];
  const common = {
    program: { version: input.programVersion },
    catalog,
    site: input.settings,
    builtOn: input.builtOn,
  };

  for (const { outcome, text } of input.outcomes) {
    const fileName = outcome.file.replace(/^.*[\\/]/, '');
    if (!outcome.ok) {
      rows.push({
        sortKey: outcome.session?.date ?? '',
        date: outcome.session?.date ?? null,
        title: outcome.session?.title ?? fileName,
        file: fileName,
        href: null,
        source: outcome.session?.source.kind ?? '—',
        explanation: 'not built: see the problems below',
        confidence: '—',
        status: 'failed',
        diagnostics: outcome.diagnostics.map((d: Diagnostic) =>
          formatDiagnosticLine({ ...d, file: fileName }),
        ),
      });
      continue;
    }
    const { session, reduction, identification } = outcome;
    const result = buildResult(reduction, identification, catalog, input.programVersion);
    const model = await sessionPageModel(
      {
        session,
        reduction,
        identification,
        result,
        catalog,
        warnings: outcome.warnings.map((d) => formatDiagnosticLine({ ...d, file: fileName })),
        buildOptions: input.buildOptions,
        programVersion: input.programVersion,
      },
      cache,
    );
    const dir = `sessions/${session.id}`;
    const body = templates.session({ ...model, root: '../../' });
    files.push({
      path: `${dir}/index.html`,
      contents: templates.layout({
        ...common,
        root: '../../',
        pageTitle: `${session.title} — ${input.settings.title}`,
        body,
      }),
    });
    files.push({ path: `${dir}/result.json`, contents: `${JSON.stringify(result, null, 2)}\n` });
    files.push({ path: `${dir}/lines.csv`, contents: linesCsv(result) });
    files.push({ path: `${dir}/session.yaml`, contents: text });
    for (const s of identification.explanation.species) overview.push({ session: session.id, species: s });
    rows.push({
      sortKey: session.date ?? '',
      date: session.date,
      title: session.title,
      file: fileName,
      href: `${dir}/index.html`,
      source: `${session.source.kind}${session.source.name ? ` — ${session.source.name}` : ''}`,
      explanation: identification.explanation.summary,
      confidence: identification.explanation.species.length
        ? percent(identification.explanation.confidence)
        : '—',
      status: identification.explanation.status,
      diagnostics: [],
    });
  }

  // Newest first; undated last; ties by title so the order never depends on the file system.
  rows.sort(
    (a, b) =>
      (b.sortKey || '0').localeCompare(a.sortKey || '0') ||
      a.title.localeCompare(b.title) ||
      a.file.localeCompare(b.file),
  );
  const count = (s: string) => rows.filter((r) => r.status === s).length;
  const overviewCaption = `Species in each session's explanation (${overview.length} findings across ${rows.length} sessions).`;
  const overviewChartSvg =
    overview.length > 0 ? (await renderChart(overviewChart(overviewCaption, overview), cache)).svg : null;
  const indexBody = templates.index({
    ...common,
    root: '',
    site: { ...input.settings, introHtml: renderNotes(input.settings.introMarkdown) },
    sessions: rows,
    counts: {
      total: rows.length,
      one: rows.length === 1,
      identified: count('identified'),
      ambiguous: count('ambiguous'),
      unexplained: count('unexplained'),
      failed: count('failed'),
    },
    overview: overviewChartSvg ? { svg: overviewChartSvg, caption: overviewCaption } : null,
    generalCaution: GENERAL_CAUTION,
  });
  files.push({
    path: 'index.html',
    contents: templates.layout({ ...common, root: '', pageTitle: input.settings.title, body: indexBody }),
  });
  return files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}
