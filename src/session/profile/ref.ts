/**
 * The profile file a session names, found before the session is read in full, so that the
 * edge (build, vet, identify) can read that file too. Pure: a lenient YAML parse of the bytes;
 * a file that does not parse names none (the full read reports its problems). The same cheap
 * guards as the full read come first (size, runaway bracket nesting), and a file without the
 * word `profile` is not parsed at all.
 */
import { parse } from 'yaml';
import { excessiveFlowNesting, SESSION_LIMITS } from '../limits.js';

export function profileFileOf(bytes: Uint8Array): string | null {
  if (bytes.byteLength > SESSION_LIMITS.maxBytes) return null;
  const text = new TextDecoder().decode(bytes);
  if (!text.includes('profile')) return null;
  if (excessiveFlowNesting(text, SESSION_LIMITS.maxDepth) >= 0) return null;
  try {
    const data: unknown = parse(text, { maxAliasCount: SESSION_LIMITS.maxAliasCount });
    if (data === null || typeof data !== 'object') return null;
    const profile = (data as Record<string, unknown>).profile;
    if (profile === null || typeof profile !== 'object') return null;
    const file = (profile as Record<string, unknown>).file;
    return typeof file === 'string' && file !== '' ? file : null;
  } catch {
    return null;
  }
}
