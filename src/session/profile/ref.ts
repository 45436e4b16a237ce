/**
 * The profile file a session names, found before the session is read in full, so that the
 * edge (build, vet, identify) can read that file too. Pure: a lenient YAML parse of the bytes;
 * a file that does not parse names none (the full read reports its problems).
 */
import { parse } from 'yaml';

export function profileFileOf(bytes: Uint8Array): string | null {
  try {
    const data: unknown = parse(new TextDecoder().decode(bytes), { maxAliasCount: 50 });
    if (data === null || typeof data !== 'object') return null;
    const profile = (data as Record<string, unknown>).profile;
    if (profile === null || typeof profile !== 'object') return null;
    const file = (profile as Record<string, unknown>).file;
    return typeof file === 'string' && file !== '' ? file : null;
  } catch {
    return null;
  }
}
