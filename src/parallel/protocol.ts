/** Messages between the build and its workers (plain values: structured clone carries them). */
import type { Catalog } from '../lines/types.js';
import type { SessionOutcome } from '../pipeline.js';
import type { RenderContext } from '../report/site.js';
import type { TemplateTexts } from '../report/templates.js';
import type { ProfileInput } from '../session/profile/types.js';
import type { InstrumentSpec } from '../session/types.js';
import type { SessionUnit } from './unit.js';

/** What a worker loads once: the catalog is cloned in, the templates compiled from their text. */
export interface WorkerInit {
  catalog: Catalog;
  templates: TemplateTexts;
  render: Omit<RenderContext, 'catalog' | 'templates'>;
  instrumentDefaults: InstrumentSpec | null;
  /** The cache's chart folder, or null without a cache. */
  chartDir: string | null;
}

export interface TaskMessage {
  index: number;
  path: string;
  bytes: Uint8Array;
  /** The profile file the session names, read at the edge (null: it names none). */
  profile: ProfileInput | null;
}

export type ResultMessage =
  | { index: number; ok: true; unit: SessionUnit; ms: number }
  | { index: number; ok: false; error: string };

/** A session computed in the main thread, for the render thread (overlap.ts). */
export interface RenderRequest {
  index: number;
  outcome: SessionOutcome;
  /** The session file's bytes (its copy in the site). */
  bytes: Uint8Array;
  /** The profile file's bytes, copied beside session.yaml (null: none). */
  profileBytes: Uint8Array | null;
}

/** The render thread's answer: the unit, and how long rendering took there. */
export type RenderReply = ResultMessage;
