/**
 * One session through the pure stages: read → reduce → identify. Shared by `build` and
 * `identify`; never touches the disk (the caller hands in the bytes and the catalog).
 */
import type { Diagnostic } from './diagnostics.js';
import { identify } from './identify/identify.js';
import type { Identification } from './identify/types.js';
import type { Catalog } from './lines/types.js';
import { reduceSession } from './reduce/reduce.js';
import type { Reduction } from './reduce/types.js';
import { type ReadOptions, readSessionText } from './session/read.js';
import type { Session } from './session/types.js';

export type SessionOutcome =
  | {
      ok: true;
      file: string;
      session: Session;
      reduction: Reduction;
      identification: Identification;
      warnings: Diagnostic[];
    }
  | { ok: false; file: string; session: Session | null; diagnostics: Diagnostic[] };

export function runSession(
  file: string,
  bytes: Uint8Array | string,
  catalog: Catalog,
  options: ReadOptions = {},
): SessionOutcome {
  const read = readSessionText(bytes, file, options);
  if (!read.ok) return { ok: false, file, session: null, diagnostics: read.diagnostics };
  const reduced = reduceSession(read.value);
  if (!reduced.ok) return { ok: false, file, session: read.value, diagnostics: reduced.diagnostics };
  const { identification, reduction, warnings } = identify(reduced.value, catalog);
  return {
    ok: true,
    file,
    session: read.value,
    reduction,
    identification,
    warnings: [...read.warnings, ...reduced.warnings, ...warnings],
  };
}
