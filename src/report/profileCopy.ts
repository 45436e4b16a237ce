/** Where a session's profile file is copied in its record folder. */

/** Extensions a profile copy keeps (the formats the profile reader takes); anything else is .dat. */
const PROFILE_COPY_EXTENSIONS = ['.csv', '.tsv', '.txt', '.dat', '.fits', '.fit', '.fts'];

/**
 * The copy of a session's profile in its record folder, relative to the site: always
 * `sessions/<id>/profile.<ext>`. A fixed name, so that the output guard (src/write/guard.ts) can
 * tell the copy from a user's own file in a fresh checkout that has no build manifest, and so
 * that it never takes the name of one of the record's own files.
 */
export const PROFILE_COPY = new RegExp(
  `^sessions/[^/]+/profile(${PROFILE_COPY_EXTENSIONS.map((e) => e.replace('.', '\\.')).join('|')})$`,
);

/** The name of a profile's copy in the record folder: profile.<its extension>, else profile.dat. */
export function profileCopyName(name: string): string {
  const dot = name.lastIndexOf('.');
  const ext = dot > name.search(/[^\\/]*$/) ? name.slice(dot).toLowerCase() : '';
  return PROFILE_COPY_EXTENSIONS.includes(ext) ? `profile${ext}` : 'profile.dat';
}
