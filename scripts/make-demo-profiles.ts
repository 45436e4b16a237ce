/**
 * Writes the demo archive's two recorded profiles (invented scenarios of our own):
 *   data/sessions/tube-f-frame.csv — a webcam frame's column profile of an unlabelled tube F,
 *     whose gas is helium: He I lines, wavelengths and relative intensities taken from the
 *     bundled catalog (NIST ASD rows), put on an invented camera dispersion with Poisson noise;
 *   data/sessions/star-k-spectrum.fits — a 1-D FITS spectrum of an invented hot star K with
 *     Balmer absorption (H I wavelengths from the catalog's Rydberg-formula rows).
 * Seeded, so the files are the same on every run. Run with: npx tsx scripts/make-demo-profiles.ts
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadCatalog } from '../src/lines/load.js';
import { vacuumToAir } from '../src/reduce/airVacuum.js';
import { expectedCounts, poissonProfile } from '../test/helpers/profile.js';
import { gaussianDeviate, mulberry32 } from '../test/helpers/random.js';
import { fitsFile, primary } from '../test/profile/fitsWriter.js';

const dir = join(process.cwd(), 'data', 'sessions');
const loaded = loadCatalog();
if (!loaded.ok) throw new Error('catalog does not load');
const catalog = loaded.value;

/** The invented camera: λ(p) = 395 nm + 0.16 nm/px · p + 2e-6 nm/px² · p² (air). */
const lambdaOf = (p: number) => 395 + 0.16 * p + 2e-6 * p * p;
function pixelOf(nm: number): number {
  let p = (nm - 395) / 0.16;
  for (let k = 0; k < 20; k++) p -= (lambdaOf(p) - nm) / (0.16 + 4e-6 * p);
  return p;
}

function tubeProfile(): void {
  const he = catalog.species.get('He I');
  if (!he) throw new Error('no He I in the catalog');
  const lines: { centre_px: number; photons: number; sigma_px: number }[] = [];
  for (let k = 0; k < he.vacuum_nm.length; k++) {
    const air = vacuumToAir(he.vacuum_nm[k]!);
    const p = pixelOf(air);
    if (p < 5 || p > 1915 || he.intensity[k]! < 20) continue;
    lines.push({ centre_px: p, photons: 60 * he.intensity[k]!, sigma_px: 2.2 });
  }
  const n = 1920;
  // A little stray light rising to the red, as a camera frame has.
  const expected = expectedCounts(n, lines, 0).map((v, i) => v + 30 + 0.01 * i);
  const y = poissonProfile(expected, 2026_06_06);
  y[1288] = (y[1288] ?? 0) + 900; // a cosmic-ray hit the session drops
  const text = `# tube F, webcam frame 0412, column sums across the slit image (invented demo data)\npixel,counts\n${y.map((v, i) => `${i},${v}`).join('\n')}\n`;
  writeFileSync(join(dir, 'tube-f-frame.csv'), text);
  // Calibration lamps of the same set-up: Hg I (fluorescent lamp) and Ne I (indicator lamp),
  // air wavelengths as in the bundled catalog's NIST ASD rows.
  const cal = [404.656, 435.833, 546.074, 576.96, 579.066, 640.2248, 703.24126];
  process.stdout.write(
    `tube F: ${lines.length} He I lines; calibration pixels ${cal.map((nm) => `${nm} → ${pixelOf(nm).toFixed(2)}`).join(', ')}\n`,
  );
}

function starSpectrum(): void {
  const h = catalog.species.get('H I');
  if (!h) throw new Error('no H I in the catalog');
  const from_A = 3860;
  const step_A = 0.5;
  const n = 2801; // 3860–5260 Å
  const balmer: number[] = [];
  for (let k = 0; k < h.vacuum_nm.length; k++) {
    const air = vacuumToAir(h.vacuum_nm[k]!);
    if (air > 388 && air < 520 && h.intensity[k]! >= 30) balmer.push(air);
  }
  const g = mulberry32(2026_06_12);
  const flux = Array.from({ length: n }, (_, i) => {
    const nm = (from_A + step_A * i) / 10;
    let f = 1 + 0.4 * ((nm - 450) / 100); // a blue continuum falling to the red
    let t = 1;
    for (const b of balmer) t -= 0.45 * Math.exp(-0.5 * ((nm - b) / 0.55) ** 2);
    f *= t;
    return 1000 * f * (1 + 0.008 * gaussianDeviate(g));
  });
  const cards = primary(-32, n, [
    ['OBJECT', 'Star K (invented)'],
    ['CTYPE1', 'AWAV'],
    ['CUNIT1', 'Angstrom'],
    ['CRPIX1', 1],
    ['CRVAL1', from_A],
    ['CDELT1', step_A],
    ['BUNIT', 'adu'],
  ]);
  writeFileSync(join(dir, 'star-k-spectrum.fits'), fitsFile(cards, -32, flux));
  process.stdout.write(`star K: Balmer lines at ${balmer.map((b) => b.toFixed(2)).join(', ')} nm (air)\n`);
}

tubeProfile();
starSpectrum();
