/**
 * The render stage: processed sessions → the site's files (paths relative to the output
 * folder, contents as strings). Pure apart from chart rendering, which is deterministic.
 */
import { createHash } from 'node:crypto';
import type { Diagnostic } from '../diagnostics.js';
import type { Catalog } from '../lines/types.js';
import type { SessionOutcome } from '../pipeline.js';
import { GENERAL_CAUTION } from './cautions.js';
import type { ChartCache } from './charts/render.js';
import { PAGE_CSP } from './csp.js';
import { linesCsv } from './csv.js';
import { display, percent } from './format.js';
import { markdownHtml } from './markdown.js';
import { profileCopyName } from './profileCopy.js';
import { buildResult } from './result.js';
import { sessionPageModel } from './sessionPage.js';
import { STRIP_RANGE_NM, type StripLine, speciesColours, stripSvg, swatchSvg } from './strip.js';
import type { Templates } from './templates.js';
import { plainProblem } from './wording.js';

export interface SiteFile {
  path: string;
  contents: string;
  /** base64: `contents` holds binary bytes (a FITS profile), so a unit stays plain JSON. */
  encoding?: 'base64';
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
  /**
   * Whether the build also prints record.pdf (build --pdf): decided by the options, never by
   * looking at the disk, so two builds with the same options give the same bytes.
   */
  pdfLinks?: boolean;
}

/** One row of the index table; a plain value so a cached or worker-built session can carry it. */
export interface IndexRow {
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
  /** The session's lines for the index strip (rest frame, session's medium). */
  lines: StripLine[];
  /** Readable id (the folder name of the record). */
  id: string | null;
}

export interface OverviewEntry {
  session: string;
  species: string;
  /** The species as the pages write it ([O III], C III]). */
  display: string;
}

/** Everything the render stage needs besides the sessions themselves. */
export type RenderContext = Omit<RenderInput, 'outcomes'>;

/** What the index needs to know of a session it cannot link to. */
export interface SessionHeadline {
  date: string | null;
  title: string;
  sourceKind: string;
}

/** One session's share of the site: its own files, its index row and its overview findings. */
export interface SessionPart {
  files: SiteFile[];
  row: IndexRow;
  overview: OverviewEntry[];
}

function baseName(file: string): string {
  return file.replace(/^.*[\\/]/, '');
}

function commonOf(ctx: RenderContext) {
  return {
    program: { version: ctx.programVersion },
    catalog: ctx.catalog,
    site: ctx.settings,
    builtOn: ctx.builtOn,
    csp: PAGE_CSP,
  };
}

/** The index row of a session that was not built (its problems listed under it). */
export function failedRow(
  fileName: string,
  headline: SessionHeadline | null,
  diagnostics: readonly Diagnostic[],
): IndexRow {
  return {
    sortKey: headline?.date ?? '',
    date: headline?.date?.slice(0, 10) ?? null,
    title: headline?.title ?? fileName,
    file: fileName,
    href: null,
    source: headline?.sourceKind ?? '—',
    explanation: 'not built: see the problems below',
    confidence: '—',
    status: 'failed',
    diagnostics: diagnostics.map((d) => plainProblem(d)),
    lines: [],
    id: null,
  };
}

/**
 * One session → its files and index row. Depends only on the outcome, its text and the
 * context, which is what lets a build cache it or run it in a worker.
 */
export async function renderSessionPart(
  outcome: SessionOutcome,
  text: string,
  ctx: RenderContext,
  cache: ChartCache = new Map(),
  /** The profile file the session names, copied beside session.yaml so the record is whole. */
  profileBytes: Uint8Array | null = null,
): Promise<SessionPart> {
  const { catalog, templates } = ctx;
  const fileName = baseName(outcome.file);
  if (!outcome.ok) {
    const headline = outcome.session
      ? { date: outcome.session.date, title: outcome.session.title, sourceKind: outcome.session.source.kind }
      : null;
    return { files: [], row: failedRow(fileName, headline, outcome.diagnostics), overview: [] };
  }
  const { session, reduction, identification } = outcome;
  const result = buildResult(reduction, identification, catalog, ctx.programVersion);
  const model = await sessionPageModel(
    {
      session,
      reduction,
      identification,
      result,
      catalog,
      warnings: outcome.warnings.map((d) => plainProblem(d, session.source.kind)),
      buildOptions: ctx.buildOptions,
      programVersion: ctx.programVersion,
      pdfLink: ctx.pdfLinks === true,
    },
    cache,
  );
  const dir = `sessions/${session.id}`;
  const body = templates.session({ ...model, root: '../../' });
  const files: SiteFile[] = [
    {
      path: `${dir}/index.html`,
      contents: templates.layout({
        ...commonOf(ctx),
        root: '../../',
        pageTitle: `${session.title} — ${ctx.settings.title}`,
        body,
      }),
    },
    { path: `${dir}/result.json`, contents: `${JSON.stringify(result, null, 2)}\n` },
    { path: `${dir}/lines.csv`, contents: linesCsv(result) },
    { path: `${dir}/session.yaml`, contents: text },
  ];
  if (profileBytes && session.profile)
    files.push({
      path: `${dir}/${profileCopyName(session.profile.file)}`,
      contents: Buffer.from(profileBytes.buffer, profileBytes.byteOffset, profileBytes.byteLength).toString(
        'base64',
      ),
      encoding: 'base64',
    });
  return {
    files,
    overview: identification.explanation.species.map((s) => ({
      session: session.id,
      species: s,
      display: identification.display[s] ?? s,
    })),
    row: {
      sortKey: session.date ?? '',
      // The day is enough in the list; the record keeps the full date-time.
      date: session.date?.slice(0, 10) ?? null,
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
      id: session.id,
      lines: reduction.lines.map((l) => ({
        nm: display(l.rest_vacuum_nm, reduction.medium),
        // As the pages write it ([O III]): the strip's legend and its text.
        species: identification.lines.find((a) => a.index === l.index)?.assignment?.display ?? null,
      })),
    },
  };
}

/**
 * Sessions on one page of the index. A larger archive gets an index of pages (each with its
 * dates and counts) and one page per hundred sessions, so no page grows with the archive; a
 * smaller one keeps its single index page.
 */
export const SESSIONS_PER_PAGE = 100;

/** The file of index page `n` (1-based); beside index.html, so links need no new root. */
export function indexPagePath(n: number): string {
  return `page-${n}.html`;
}

function counted(rows: readonly IndexRow[]) {
  const count = (s: string) => rows.filter((r) => r.status === s).length;
  return {
    total: rows.length,
    one: rows.length === 1,
    identified: count('identified'),
    ambiguous: count('ambiguous'),
    unexplained: count('unexplained'),
    failed: count('failed'),
  };
}

/** First and last date of some rows (in time order), or null when none is dated. */
function dateSpan(rows: readonly IndexRow[]): { from: string; to: string } | null {
  const dated = rows.filter((r) => r.date !== null);
  const first = dated[0]?.date;
  const last = dated[dated.length - 1]?.date;
  return first && last ? { from: first, to: last } : null;
}

/**
 * The archive-wide files: the stylesheet, the index page and, for a large archive, the pages
 * of sessions, one file at a time so a build can write each as it comes. Rows come in any
 * order (sorted here). Everything is computed from the rows and overview entries, the small
 * summaries each session leaves, never from the sessions' results.
 */
export function* indexFiles(
  rowsIn: readonly IndexRow[],
  overview: readonly OverviewEntry[],
  ctx: RenderContext,
  /** The introduction as HTML (markdown.ts markdownHtml of ctx.settings.introMarkdown). */
  introHtml: string,
  perPage: number = SESSIONS_PER_PAGE,
): Generator<SiteFile> {
  for (const file of indexPlan(rowsIn, overview, ctx, introHtml, perPage)) yield file.render();
}

/** One archive-wide file, rendered on demand. */
export interface PlannedFile {
  path: string;
  /**
   * A digest of everything the file is made of but the templates, for a build's cache (a page
   * whose key is the last build's need not be rendered again); null where rendering costs less
   * than keying (the stylesheet, the home page over the whole archive).
   */
  key: string | null;
  render: () => SiteFile;
}

/** indexFiles, each file with its key and rendered only when asked (a large archive's pages). */
export function* indexPlan(
  rowsIn: readonly IndexRow[],
  overview: readonly OverviewEntry[],
  ctx: RenderContext,
  introHtml: string,
  perPage: number = SESSIONS_PER_PAGE,
): Generator<PlannedFile> {
  const { templates } = ctx;
  const common = commonOf(ctx);
  // In time order, oldest first, as a club's log reads; undated last; ties by title so the
  // order never depends on the file system.
  const rows = [...rowsIn].sort(
    (a, b) =>
      (a.sortKey || '9').localeCompare(b.sortKey || '9') ||
      a.title.localeCompare(b.title) ||
      a.file.localeCompare(b.file),
  );
  // One colour per species across the archive, so a species looks the same on every page.
  const colours = speciesColours(rows.map((r) => r.lines));
  const shown = (r: IndexRow) => ({
    ...r,
    strip: r.lines.length ? stripSvg(r.lines, colours) : null,
    speciesKey: [...new Set(r.lines.map((l) => l.species).filter((x): x is string => x !== null))]
      .sort()
      .map((species) => ({ species, swatch: swatchSvg(colours.get(species) ?? null) })),
    unexplainedSwatch: r.lines.some((l) => l.species === null) ? swatchSvg(null) : null,
  });
  const site = { ...ctx.settings, introHtml };
  const page = (path: string, pageTitle: string, model: Record<string, unknown>): SiteFile => ({
    path,
    contents: templates.layout({
      ...common,
      root: '',
      pageTitle,
      body: templates.index({
        ...common,
        root: '',
        site,
        stripRange: STRIP_RANGE_NM,
        generalCaution: GENERAL_CAUTION,
        ...model,
      }),
    }),
  });
  const now = (file: () => SiteFile): PlannedFile => {
    const made = file();
    return { path: made.path, key: null, render: () => made };
  };
  yield now(() => ({ path: 'style.css', contents: templates.css }));
  if (rows.length <= perPage) {
    yield now(() =>
      page('index.html', ctx.settings.title, {
        single: true,
        sessions: rows.map(shown),
        counts: counted(rows),
        overview: overview.length > 0,
        bySpecies: sessionsBySpecies(rows, overview),
      }),
    );
    return;
  }
  const pageCount = Math.ceil(rows.length / perPage);
  const slices = Array.from({ length: pageCount }, (_, i) => rows.slice(i * perPage, (i + 1) * perPage));
  const pageLinks = slices.map((slice, i) => ({
    number: i + 1,
    href: indexPagePath(i + 1),
    first: i * perPage + 1,
    last: i * perPage + slice.length,
    span: dateSpan(slice),
    counts: counted(slice),
  }));
  yield now(() =>
    page('index.html', ctx.settings.title, {
      home: true,
      counts: counted(rows),
      perPage,
      pages: pageLinks,
      overview: overview.length > 0,
      speciesSummary: speciesSummary(rows, overview),
    }),
  );
  // What every page shares, for the pages' keys (the catalog by version and digest).
  const shared = JSON.stringify({
    program: ctx.programVersion,
    catalog: [ctx.catalog.version, ctx.catalog.sha256],
    site,
    builtOn: ctx.builtOn,
    csp: PAGE_CSP,
    of: rows.length,
    pageCount,
  });
  for (const [i, slice] of slices.entries()) {
    const link = pageLinks[i] as (typeof pageLinks)[number];
    const pageIds = new Set<string>();
    for (const r of slice) if (r.id !== null) pageIds.add(r.id);
    const here = overview.filter((o) => pageIds.has(o.session));
    const title = `Sessions ${link.first}–${link.last} — ${ctx.settings.title}`;
    // A page is its rows, their species' colours, its own overview entries and its place.
    const species = [...new Set(slice.flatMap((r) => r.lines.map((l) => l.species)))].sort();
    const key = createHash('sha256')
      .update(shared)
      .update(JSON.stringify([link, title, slice, here, species.map((sp) => [sp, colours.get(sp ?? '')])]))
      .digest('hex');
    yield {
      path: link.href,
      key,
      render: () =>
        page(link.href, title, {
          paged: true,
          sessions: slice.map(shown),
          counts: link.counts,
          page: link,
          pageCaption: `Sessions ${link.first}–${link.last} of the archive`,
          of: rows.length,
          pageCount,
          previous: i > 0 ? indexPagePath(i) : null,
          next: i + 1 < pageCount ? indexPagePath(i + 2) : null,
          overview: here.length > 0,
          bySpecies: sessionsBySpecies(slice, here),
        }),
    };
  }
}

/** The archive-wide files as one list (see indexFiles, which a build writes one by one). */
export async function renderIndexFiles(
  rowsIn: readonly IndexRow[],
  overview: readonly OverviewEntry[],
  ctx: RenderContext,
  // The introduction's rendered Markdown is kept here (the index draws no chart of its own).
  cache: ChartCache = new Map(),
  perPage: number = SESSIONS_PER_PAGE,
): Promise<SiteFile[]> {
  const introHtml = await markdownHtml(ctx.settings.introMarkdown, cache);
  return [...indexFiles(rowsIn, overview, ctx, introHtml, perPage)];
}

export function sortFiles(files: SiteFile[]): SiteFile[] {
  return files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
}

export async function renderSite(input: RenderInput, cache: ChartCache = new Map()): Promise<SiteFile[]> {
  const { outcomes, ...ctx } = input;
  const files: SiteFile[] = [];
  const rows: IndexRow[] = [];
  const overview: OverviewEntry[] = [];
  for (const { outcome, text } of outcomes) {
    const part = await renderSessionPart(outcome, text, ctx, cache);
    files.push(...part.files);
    rows.push(part.row);
    overview.push(...part.overview);
  }
  files.push(...(await renderIndexFiles(rows, overview, ctx, cache)));
  return sortFiles(files);
}

/** The overview chart's numbers as a list: each species with the sessions that found it. */
function sessionsBySpecies(rows: readonly IndexRow[], overview: readonly OverviewEntry[]) {
  const byHref = new Map(rows.filter((r) => r.href).map((r) => [r.href, r]));
  const groups = new Map<string, { title: string; href: string }[]>();
  const shown = new Map<string, string>();
  for (const o of overview) {
    const row = byHref.get(`sessions/${o.session}/index.html`);
    if (!row?.href) continue;
    const list = groups.get(o.species) ?? [];
    list.push({ title: row.title, href: row.href });
    groups.set(o.species, list);
    shown.set(o.species, o.display);
  }
  return [...groups.entries()]
    .sort((a, b) => a[0].localeCompare(b[0]))
    .map(([species, sessions]) => ({
      species: shown.get(species) ?? species,
      sessions: sessions.sort((x, y) => x.title.localeCompare(y.title)),
    }));
}

/**
 * The overview of a paged index: each species with how many sessions found it and the first
 * and latest of them (rows in time order), from the overview entries alone.
 */
export function speciesSummary(rows: readonly IndexRow[], overview: readonly OverviewEntry[]) {
  const order = new Map<string, number>();
  rows.forEach((r, i) => {
    if (r.id !== null && r.href !== null) order.set(r.id, i);
  });
  const groups = new Map<string, { count: number; first: number; last: number }>();
  const shown = new Map<string, string>();
  for (const o of overview) {
    const at = order.get(o.session);
    if (at === undefined) continue;
    shown.set(o.species, o.display);
    const g = groups.get(o.species);
    if (!g) groups.set(o.species, { count: 1, first: at, last: at });
    else {
      g.count++;
      g.first = Math.min(g.first, at);
      g.last = Math.max(g.last, at);
    }
  }
  const link = (i: number) => {
    const r = rows[i] as IndexRow;
    return { title: r.title, href: r.href, date: r.date };
  };
  return [...groups.entries()]
    .sort((a, b) => a[0].localeCompare(b[0]))
    .map(([species, g]) => ({
      species: shown.get(species) ?? species,
      count: g.count,
      first: link(g.first),
      last: link(g.last),
    }));
}
