/**
 * Barycentric radial-velocity correction: the observer's velocity relative to the solar-system
 * barycentre, projected on the direction to the target. It is what must be added to a
 * topocentric radial velocity to refer it to the barycentre (v_bary = v_topo + correction, to
 * first order in v/c).
 *
 * The observer's velocity is the Earth's barycentric velocity (astronomy-engine `BaryState`,
 * which sums the VSOP87 planetary terms and the Moon's pull on the Earth) plus the site's
 * velocity about the geocentre from the Earth's rotation (`ObserverState`), both in the J2000
 * mean equator (EQJ). ICRS coordinates differ from EQJ by the frame bias, about 0.02″, which
 * moves the projection by far less than 1 m/s. Accuracy is at the few-m/s level, well inside
 * what a grating measurement can resolve.
 */

import { BaryState, Body, MakeTime, Observer, ObserverState } from 'astronomy-engine';
import { KM_PER_AU, RAD_PER_DEG, SECONDS_PER_DAY } from '../constants.js';
import type { Diagnostic, Outcome } from '../diagnostics.js';
import { positionOfField } from '../session/normalize.js';
import type { Session } from '../session/types.js';
import type { BarycentricCorrection } from './types.js';

const KM_S_PER_AU_DAY = KM_PER_AU / SECONDS_PER_DAY;

export interface BarycentricInput {
  ra_deg: number;
  dec_deg: number;
  /** The instant as a Date (UTC). */
  date: Date;
  lat_deg: number;
  lon_deg: number;
  elevation_m: number;
}

/** Unit vector to (α, δ) in equatorial coordinates. */
export function unitVector(ra_deg: number, dec_deg: number): [number, number, number] {
  const a = ra_deg * RAD_PER_DEG;
  const d = dec_deg * RAD_PER_DEG;
  return [Math.cos(d) * Math.cos(a), Math.cos(d) * Math.sin(a), Math.sin(d)];
}

/** The correction in km/s (positive when the observer moves towards the target). */
export function barycentricCorrectionKmS(input: BarycentricInput): number {
  const time = MakeTime(input.date);
  const earth = BaryState(Body.Earth, time);
  // Longitudes up to 360° are allowed in the session file; the Observer wants −180…180.
  const lon = ((((input.lon_deg + 180) % 360) + 360) % 360) - 180;
  const site = ObserverState(time, new Observer(input.lat_deg, lon, input.elevation_m), false);
  const [nx, ny, nz] = unitVector(input.ra_deg, input.dec_deg);
  return (
    ((earth.vx + site.vx) * nx + (earth.vy + site.vy) * ny + (earth.vz + site.vz) * nz) * KM_S_PER_AU_DAY
  );
}

/**
 * Reads a session date-time as UTC. A time without a zone is taken as UTC (the format says
 * dates are UTC); a date without a time is refused, because the Earth's rotation alone moves
 * the correction by up to ±0.46 km/s over a day.
 */
export function parseUtcDateTime(text: string): Date | null {
  const m = /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}(?::\d{2}(?:\.\d+)?)?)(Z|[+-]\d{2}:?\d{2})?$/.exec(
    text.trim(),
  );
  if (!m) return null;
  let zone = m[3] ?? 'Z';
  if (/^[+-]\d{4}$/.test(zone)) zone = `${zone.slice(0, 3)}:${zone.slice(3)}`;
  const date = new Date(`${m[1]}T${m[2]}${zone}`);
  return Number.isNaN(date.getTime()) ? null : date;
}

/** The session's correction, null when none was asked for, or diagnostics when it cannot be made. */
export function sessionBarycentricCorrection(session: Session): Outcome<BarycentricCorrection | null> {
  const request = session.barycentric;
  if (!request) return { ok: true, value: null, warnings: [] };
  const problems: Diagnostic[] = [];
  const problem = (field: string, message: string, hint: string) =>
    problems.push({
      file: session.file,
      ...positionOfField(session, field),
      severity: 'error',
      code: 'barycentric-input',
      field,
      message,
      hint,
    });
  const date = session.date === null ? null : parseUtcDateTime(session.date);
  if (date === null)
    problem('date', 'a barycentric correction needs a UTC date-time', 'write date: 2026-03-14T21:30:00Z');
  const lat = session.site?.lat ?? null;
  const lon = session.site?.lon ?? null;
  if (lat === null || lon === null)
    problem(
      'site',
      'a barycentric correction needs site.lat and site.lon',
      'add the site latitude and longitude in degrees',
    );
  if (date === null || lat === null || lon === null) return { ok: false, diagnostics: problems };
  const elevation_m = session.site?.elevation_m ?? 0;
  const correction_km_s = barycentricCorrectionKmS({
    ra_deg: request.ra_deg,
    dec_deg: request.dec_deg,
    date,
    lat_deg: lat,
    lon_deg: lon,
    elevation_m,
  });
  return {
    ok: true,
    value: {
      correction_km_s,
      ra_deg: request.ra_deg,
      dec_deg: request.dec_deg,
      date_utc: date.toISOString(),
      lat_deg: lat,
      lon_deg: lon,
      elevation_m,
      method:
        'observer velocity relative to the solar-system barycentre (astronomy-engine BaryState of the Earth + ObserverState of the site, J2000 equator) projected on the target direction',
    },
    warnings: [],
  };
}
