/**
 * What a profile must be before lines are looked for in it: enough points, finite positions
 * and uncertainties, one direction along the axis. A falling axis is turned round (some
 * instruments save red to blue); undefined intensities (FITS BLANK or NaN) are left out with
 * a warning, as the Standard means them as "no value" (FITS Standard 4.0 §4.4.2.5, §5.3).
 */
import type { ProfileData, ProfileProblem } from './types.js';

/** Fewer points than this hold no line and a continuum both (a few FWHM of each, common practice). */
export const MIN_PROFILE_POINTS = 16;
export const MAX_PROFILE_POINTS = 1_000_000;

export interface ProfileCheck {
  profile: ProfileData | null;
  problems: ProfileProblem[];
  warnings: ProfileProblem[];
}

export function checkProfile(p: ProfileData, name: string): ProfileCheck {
  const problems: ProfileProblem[] = [];
  const warnings: ProfileProblem[] = [];
  if (p.x.length > MAX_PROFILE_POINTS)
    problems.push({
      code: 'profile-too-long',
      message: `${name} has ${p.x.length} points; the limit is ${MAX_PROFILE_POINTS}`,
      hint: 'cut the profile to the range of interest, or bin it',
    });
  const badX = p.x.findIndex((v) => !Number.isFinite(v));
  if (badX >= 0)
    problems.push({
      code: 'profile-bad-value',
      message: `${name} point ${badX + 1} has no finite position`,
      hint: 'every row needs a number for its pixel or wavelength',
    });
  const badS = p.sigma ? p.sigma.findIndex((v) => !(Number.isFinite(v) && v > 0)) : -1;
  if (badS >= 0)
    problems.push({
      code: 'profile-bad-value',
      message: `${name} point ${badS + 1} has an uncertainty that is not a positive number`,
      hint: 'give every point a positive uncertainty, or leave the column out',
    });
  if (problems.length > 0) return { profile: null, problems, warnings };

  let { x, intensity, sigma } = p;
  if (x.length >= 2 && x[0]! > x[x.length - 1]!) {
    x = [...x].reverse();
    intensity = [...intensity].reverse();
    sigma = sigma ? [...sigma].reverse() : null;
  }
  for (let i = 1; i < x.length; i++) {
    if (!(x[i]! > x[i - 1]!)) {
      problems.push({
        code: 'profile-not-monotonic',
        message: `${name}: the axis does not run one way: point ${i + 1} (${x[i]}) is not beyond point ${i} (${x[i - 1]})`,
        hint: 'sort the rows by position and remove repeated positions',
      });
      return { profile: null, problems, warnings };
    }
  }
  const keep = intensity.map((v) => Number.isFinite(v));
  const dropped = keep.filter((k) => !k).length;
  if (dropped > 0) {
    warnings.push({
      code: 'profile-undefined-values',
      message: `${name}: ${dropped} point${dropped === 1 ? ' has' : 's have'} no finite intensity and ${dropped === 1 ? 'is' : 'are'} left out`,
      hint: 'nothing to do if these are edges or bad pixels',
    });
    x = x.filter((_, i) => keep[i]);
    intensity = intensity.filter((_, i) => keep[i]);
    sigma = sigma ? sigma.filter((_, i) => keep[i]) : null;
  }
  if (x.length < MIN_PROFILE_POINTS) {
    problems.push({
      code: 'profile-too-short',
      message: `${name} has ${x.length} usable points; at least ${MIN_PROFILE_POINTS} are needed`,
      hint: 'give the whole profile, not a few samples of it',
    });
    return { profile: null, problems, warnings };
  }
  return { profile: { ...p, x, intensity, sigma }, problems, warnings };
}
