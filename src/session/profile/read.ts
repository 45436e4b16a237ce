/**
 * Profile bytes → a checked profile, pure. FITS is recognised by its first record
 * (`SIMPLE  =`, FITS Standard 4.0 §4.4.1.1), anything else is read as delimited text.
 */
import { checkProfile, type ProfileCheck } from './check.js';
import { parseDelimitedProfile } from './csv.js';
import { parseFitsProfile } from './fits.js';
import type { ProfileAxis } from './types.js';

export interface ProfileReadOptions {
  /** Axis of a text profile's first column (FITS says its own). */
  axis: ProfileAxis;
  /** nm per unit of a text profile's wavelength column. */
  nmPerUnit: number;
}

export function isFits(bytes: Uint8Array): boolean {
  return new TextDecoder('latin1').decode(bytes.subarray(0, 10)) === 'SIMPLE  = ';
}

export function readProfileBytes(bytes: Uint8Array, name: string, options: ProfileReadOptions): ProfileCheck {
  let parsed: ReturnType<typeof parseFitsProfile>;
  if (isFits(bytes)) parsed = parseFitsProfile(bytes, name);
  else {
    let text: string;
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      return {
        profile: null,
        warnings: [],
        problems: [
          {
            code: 'profile-unreadable',
            message: `${name} is neither a FITS file nor UTF-8 text`,
            hint: 'save the profile as CSV/TSV text or as FITS',
          },
        ],
      };
    }
    parsed = parseDelimitedProfile(text, { axis: options.axis, nmPerUnit: options.nmPerUnit, name });
  }
  if (!parsed.ok) return { profile: null, problems: parsed.problems, warnings: [] };
  return checkProfile(parsed.profile, name);
}
