import { BaryState, Body, MakeTime } from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  EARTH_ROTATION_RAD_S,
  KM_PER_AU,
  SECONDS_PER_DAY,
  WGS84_EQUATORIAL_RADIUS_KM,
  WGS84_FLATTENING,
} from '../../src/constants.js';
import { barycentricCorrectionKmS, parseUtcDateTime, unitVector } from '../../src/reduce/barycentric.js';
import { reduced, reduceFailures, sessionOf } from './helpers.js';

const RAD = Math.PI / 180;

// Published worked value: the Astropy documentation, "Radial Velocity Corrections"
// (docs/coordinates/velocities.rst): an object at RA 4.88375°, Dec +35.0436389° seen from
// Keck (lat 19.8283°, lon −155.4783°, 4160 m) at 2016-06-04T00:00 UTC has a barycentric
// correction of 20.077135 km/s.
const KECK = { lat_deg: 19.8283, lon_deg: -155.4783, elevation_m: 4160 };
const TARGET = { ra_deg: 4.88375, dec_deg: 35.0436389 };
const WHEN = new Date('2016-06-04T00:00:00Z');

describe('barycentric correction', () => {
  it('matches the published Astropy worked value to 0.1 km/s', () => {
    const v = barycentricCorrectionKmS({ ...TARGET, ...KECK, date: WHEN });
    expect(Math.abs(v - 20.077135)).toBeLessThan(0.1);
  });

  it('the Earth-rotation part agrees with a hand computation from sidereal time', () => {
    // Orbital part alone, from astronomy-engine's Earth state (AU/day → km/s).
    const earth = BaryState(Body.Earth, MakeTime(WHEN));
    const n = unitVector(TARGET.ra_deg, TARGET.dec_deg);
    const orbital = (earth.vx * n[0] + earth.vy * n[1] + earth.vz * n[2]) * (KM_PER_AU / SECONDS_PER_DAY);
    const rotation = barycentricCorrectionKmS({ ...TARGET, ...KECK, date: WHEN }) - orbital;

    // First principles: GMST from Meeus, Astronomical Algorithms (2nd ed.), eq. 12.4 (UT1 ≈ UTC);
    // the site's distance from the axis on the WGS 84 ellipsoid; v = ω × r projected on the target:
    // v·n̂ = −ω·ρcosφ′·cos δ·sin H, with H = LST − α the hour angle.
    const jd = WHEN.getTime() / 86_400_000 + 2_440_587.5;
    const t = (jd - 2_451_545) / 36_525;
    const gmst =
      280.460_618_37 +
      360.985_647_366_29 * (jd - 2_451_545) +
      0.000_387_933 * t * t -
      (t * t * t) / 38_710_000;
    const hourAngle = (gmst + KECK.lon_deg - TARGET.ra_deg) * RAD;
    const phi = KECK.lat_deg * RAD;
    const e2 = WGS84_FLATTENING * (2 - WGS84_FLATTENING);
    const primeVertical = WGS84_EQUATORIAL_RADIUS_KM / Math.sqrt(1 - e2 * Math.sin(phi) ** 2);
    const axisDistance = (primeVertical + KECK.elevation_m / 1000) * Math.cos(phi);
    const hand = -EARTH_ROTATION_RAD_S * axisDistance * Math.cos(TARGET.dec_deg * RAD) * Math.sin(hourAngle);
    // Precession 2000 → 2016 of (α, δ) is ignored by the hand value: ~0.2°, a few m/s here.
    expect(Math.abs(rotation - hand)).toBeLessThan(0.005);
    expect(Math.abs(hand)).toBeGreaterThan(0.2); // the check is not vacuous: the term is there
  });

  it('reverses sign for the opposite direction on the sky', () => {
    const there = barycentricCorrectionKmS({ ...TARGET, ...KECK, date: WHEN });
    const opposite = barycentricCorrectionKmS({
      ra_deg: TARGET.ra_deg + 180,
      dec_deg: -TARGET.dec_deg,
      ...KECK,
      date: WHEN,
    });
    expect(opposite).toBeCloseTo(-there, 9);
  });

  it('reads UTC date-times, with or without a zone, and refuses a bare date', () => {
    expect(parseUtcDateTime('2026-03-14T21:30:00Z')?.toISOString()).toBe('2026-03-14T21:30:00.000Z');
    expect(parseUtcDateTime('2026-03-14 21:30')?.toISOString()).toBe('2026-03-14T21:30:00.000Z');
    expect(parseUtcDateTime('2026-03-14T22:30:00+0100')?.toISOString()).toBe('2026-03-14T21:30:00.000Z');
    expect(parseUtcDateTime('2026-03-14')).toBeNull();
  });
});

describe('barycentric correction wired into the shift', () => {
  const star = (shift: string) => `lineledger: 1
date: 2016-06-04T00:00:00Z
site: { lat: 19.8283, lon: -155.4783, elevation_m: 4160 }
source: { kind: star }
medium: vacuum
shift:
${shift}
  barycentric: { ra: 4.88375, dec: 35.0436389 }
lines:
  - wavelength: 656.5
    sigma: 0.1
`;

  it('a known barycentric velocity is removed as v_topo = v_bary − correction', () => {
    const r = reduced(star('  velocity_km_s: 40\n  velocity_sigma_km_s: 2'));
    const shift = r.shift!;
    const correction = shift.barycentric!.correction_km_s;
    expect(Math.abs(correction - 20.077135)).toBeLessThan(0.1);
    expect(shift.velocity_km_s).toBeCloseTo(40 - correction, 3);
    expect(shift.velocity_sigma_km_s).toBeCloseTo(2, 3);
    // Rest wavelength from the topocentric shift, relativistic Doppler: λ_rest = λ_obs·√((1−β)/(1+β)).
    const beta = (40 - correction) / 299_792.458;
    expect(r.lines[0]!.rest_vacuum_nm).toBeCloseTo(656.5 * Math.sqrt((1 - beta) / (1 + beta)), 6);
  });

  it('a known barycentric redshift is turned topocentric the same way', () => {
    const r = reduced(star('  redshift: 0.0001'));
    const v_bary = 299_792.458 * ((1.0001 ** 2 - 1) / (1.0001 ** 2 + 1));
    expect(r.shift!.velocity_km_s).toBeCloseTo(v_bary - r.shift!.barycentric!.correction_km_s, 3);
  });

  it('a velocity search keeps the correction with nothing removed', () => {
    const r = reduced(star('  velocity_km_s: { search: [-100, 100] }'));
    expect(r.shift?.source).toBe('search');
    expect(r.shift?.z).toBe(0);
    expect(r.shift?.barycentric?.correction_km_s).toBeCloseTo(20.07, 1);
    expect(r.lines[0]!.rest_vacuum_nm).toBe(656.5);
  });

  it('without a date-time the reducer refuses, even for a Session built in code', () => {
    const s = sessionOf(star('  velocity_km_s: 40'));
    const d = reduceFailures({ ...s, date: '2016-06-04' });
    expect(d.some((x) => x.code === 'barycentric-input' && x.field === 'date')).toBe(true);
  });
});
