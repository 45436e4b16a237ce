/**
 * The unit of work of a build: one session file → its share of the site, as a plain value that
 * can cross a worker boundary and sit in the cache. Runs the pure stages and the session's part
 * of the render stage; the same function serves the serial path and the workers.
 */
import type { Diagnostic } from '../diagnostics.js';
import { runSession, type SessionOutcome } from '../pipeline.js';
import type { ChartCache } from '../report/charts/render.js';
import {
  type RenderContext,
  renderSessionPart,
  type SessionHeadline,
  type SessionPart,
} from '../report/site.js';
import type { ProfileInput } from '../session/profile/types.js';
import type { InstrumentSpec } from '../session/types.js';
import { NotingCache } from './noting.js';

export interface SessionUnit {
  /** The file's base name; diagnostics carry it too (the build puts the full path back). */
  fileName: string;
  ok: boolean;
  id: string | null;
  headline: SessionHeadline | null;
  /** The problems that stopped it (when not ok). */
  diagnostics: Diagnostic[];
  warnings: Diagnostic[];
  part: SessionPart;
  /** Spec hashes of the charts its page uses, so the chart cache keeps them. */
  charts: string[];
}

export interface UnitContext {
  render: RenderContext;
  instrumentDefaults: InstrumentSpec | null;
}

export { NotingCache } from './noting.js';

const baseName = (file: string) => file.replace(/^.*[\\/]/, '');

export async function processSession(
  path: string,
  bytes: Uint8Array,
  ctx: UnitContext,
  charts: ChartCache,
  profile: ProfileInput | null = null,
): Promise<SessionUnit> {
  const outcome = computeSession(path, bytes, ctx, profile);
  return renderUnit(outcome, bytes, ctx.render, charts, profile && 'bytes' in profile ? profile.bytes : null);
}

/** The pure stages of one session: read, reduce, identify. */
export function computeSession(
  path: string,
  bytes: Uint8Array,
  ctx: UnitContext,
  profile: ProfileInput | null = null,
): SessionOutcome {
  return runSession(path, bytes, ctx.render.catalog, { instrumentDefaults: ctx.instrumentDefaults, profile });
}

/**
 * The session's part of the render stage, from its outcome: its pages, charts and copies, as a
 * unit. A render thread runs this half on outcomes computed elsewhere (overlap.ts).
 */
export async function renderUnit(
  outcome: SessionOutcome,
  bytes: Uint8Array,
  render: RenderContext,
  charts: ChartCache,
  profileBytes: Uint8Array | null,
): Promise<SessionUnit> {
  const fileName = baseName(outcome.file);
  // Buffer, not TextDecoder: the copy in the site must keep a byte-order mark if there is one.
  const text = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('utf8');
  const noting = new NotingCache(charts);
  const part = await renderSessionPart(outcome, text, render, noting, profileBytes);
  const local = (d: Diagnostic): Diagnostic => ({ ...d, file: fileName });
  const session = outcome.session;
  return {
    fileName,
    ok: outcome.ok,
    id: session?.id ?? null,
    headline: session ? { date: session.date, title: session.title, sourceKind: session.source.kind } : null,
    diagnostics: outcome.ok ? [] : outcome.diagnostics.map(local),
    warnings: outcome.ok ? outcome.warnings.map(local) : [],
    part,
    charts: [...noting.asked].sort(),
  };
}
