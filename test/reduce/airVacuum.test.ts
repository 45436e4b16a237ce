import { describe, expect, it } from 'vitest';
import { airToVacuum, vacuumPerAirSlope, vacuumToAir } from '../../src/reduce/airVacuum.js';

describe('air ↔ vacuum (IAU standard, Morton 2000)', () => {
  it('Na I D2: vacuum 589.1583 nm → air 588.9950 nm', () => {
    // NIST Atomic Spectra Database (Kramida, Ralchenko, Reader & NIST ASD Team), Na I 3s–3p3/2.
    expect(Math.abs(vacuumToAir(589.1583) - 588.995)).toBeLessThan(0.0005);
  });

  it('Na I D1: vacuum 589.7558 nm → air 589.5924 nm', () => {
    // NIST Atomic Spectra Database, Na I 3s–3p1/2.
    expect(Math.abs(vacuumToAir(589.7558) - 589.5924)).toBeLessThan(0.0005);
  });

  it('[O III]: air 500.6843 nm ↔ vacuum 500.8240 nm', () => {
    // NIST Atomic Spectra Database, O III 2p² ³P₂–¹D₂ (the nebular line).
    expect(Math.abs(airToVacuum(500.6843) - 500.824)).toBeLessThan(0.0005);
    expect(Math.abs(vacuumToAir(500.824) - 500.6843)).toBeLessThan(0.0005);
  });

  it('round trip to 1e-5 nm over 300–1100 nm', () => {
    let worst = 0;
    for (let nm = 300; nm <= 1100; nm += 0.37) {
      worst = Math.max(
        worst,
        Math.abs(vacuumToAir(airToVacuum(nm)) - nm),
        Math.abs(airToVacuum(vacuumToAir(nm)) - nm),
      );
    }
    expect(worst).toBeLessThan(1e-5);
  });

  it('air wavelengths are shorter, by n − 1 ≈ 2.8e-4 in the visible', () => {
    const ratio = airToVacuum(550) / 550;
    expect(ratio).toBeGreaterThan(1.00026);
    expect(ratio).toBeLessThan(1.0003);
    // dλ_vac/dλ_air = n + λ·dn/dλ: normal dispersion (n falls with λ) makes it a little below n.
    expect(vacuumPerAirSlope(550)).toBeLessThan(ratio);
    expect(vacuumPerAirSlope(550)).toBeGreaterThan(1);
  });

  it('below 200 nm no air wavelength is defined: values pass unchanged', () => {
    expect(vacuumToAir(121.567)).toBe(121.567);
    expect(airToVacuum(121.567)).toBe(121.567);
  });
});
