// The species real observations need (Wolf–Rayet and cool stars, the Sun, novae, active
// galaxies, lamps and flames): each in the bundled catalog with a line where observers see it.
// Wavelengths are air, from memory of the NIST ASD / NIST Handbook strong lines unless noted.
import { describe, expect, it } from 'vitest';
import { vacuumToAir } from '../../src/reduce/airVacuum.js';
import { bundledCatalog } from '../helpers/catalog.js';

const catalog = bundledCatalog();

const NEEDED: [string, number, number][] = [
  // species, air nm, tolerance nm
  ['O V', 559.2, 0.2], // WC stars (Berlind, CfA Wolf–Rayet atlas)
  ['N IV', 405.8, 0.2], // WN stars
  ['Fe II', 516.9, 0.05],
  ['Ti II', 336.1, 0.05],
  ['Si II', 634.7, 0.05],
  ['Ni I', 341.48, 0.01],
  ['Cr I', 425.43, 0.01],
  ['Mn I', 403.08, 0.01],
  ['Sc II', 424.68, 0.01],
  ['Fe VII', 608.7, 0.2], // [Fe VII] of Seyfert galaxies
  ['Ne V', 342.6, 0.2], // [Ne V] 3426 Å
  ['Li I', 670.8, 0.05],
  ['Eu2+', 450, 20], // the blue band of tri-phosphor lamps (Blasse & Grabmaier 1994)
  ['Ce3+', 580, 30], // the white LED's YAG phosphor band
  ['CaOH', 622, 10], // flame band
];

describe('coverage for real observations', () => {
  for (const [species, air, tol] of NEEDED)
    it(`has ${species} near ${air} nm (air)`, () => {
      const lines = catalog.species.get(species);
      expect(lines, species).toBeDefined();
      const near = Array.from(lines?.vacuum_nm ?? []).some((v) => Math.abs(vacuumToAir(v) - air) <= tol);
      expect(near, `${species} ${air} nm`).toBe(true);
    });
});
