/** Where a session's profile file is copied in its record folder. */

/** Names the record's own files use: a profile copy never takes one. */
const RECORD_FILES = new Set(['index.html', 'result.json', 'lines.csv', 'session.yaml', 'record.pdf']);

/** The name of a profile's copy in the record folder: its own when plain, else profile.dat. */
export function profileCopyName(name: string): string {
  const base = name.replace(/^.*[\\/]/, '');
  return /^[A-Za-z0-9][A-Za-z0-9._-]{0,99}$/.test(base) && !RECORD_FILES.has(base.toLowerCase())
    ? base
    : 'profile.dat';
}
