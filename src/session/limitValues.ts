/**
 * The numbers of the session limits (limits.ts enforces them on the parsed YAML): apart, so that
 * reading a file's bytes at the edge need not load the YAML library.
 */
export interface SessionLimits {
  /** Size of the file in bytes. */
  maxBytes: number;
  /** Alias uses (`*name`) in one file. */
  maxAliasCount: number;
  /** Values the document would hold once every alias is expanded. */
  maxExpandedValues: number;
  /** Levels of nested mappings and lists (the top-level mapping is level 1). */
  maxDepth: number;
  /** Entries under `lines:` (the schema's maxItems says the same; a test keeps them equal). */
  maxLines: number;
  /** Keys in one mapping (the largest mapping of the format has 15). */
  maxKeys: number;
}

export const SESSION_LIMITS: SessionLimits = {
  maxBytes: 2 * 1024 * 1024,
  maxAliasCount: 50,
  maxExpandedValues: 100_000,
  maxDepth: 20,
  maxLines: 5000,
  maxKeys: 100,
};

/** Device names Windows reserves in every folder, whatever the case or extension. */
const RESERVED_NAMES = /^(con|prn|aux|nul|com[0-9]|lpt[0-9])$/;

/** True for an id that would make an unusable folder name on Windows (`sessions/con/`). */
export function isReservedId(id: string): boolean {
  return RESERVED_NAMES.test(id.toLowerCase());
}
