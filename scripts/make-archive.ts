/**
 * Generates an archive of N sessions for the bench and the build tests by varying the demo
 * sessions: new ids and titles, and small offsets on measured wavelengths and screen offsets,
 * from a fixed seed (same N and seed ⇒ same files).
 *   tsx scripts/make-archive.ts OUT_DIR [N] [SEED]
 */

import { copyFileSync, mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { mulberry32 } from '../test/helpers/random.js';

const DEMO = resolve(dirname(fileURLToPath(import.meta.url)), '..', 'data', 'sessions');

function vary(text: string, n: number, next: () => number): string {
  const tag = `a${String(n).padStart(4, '0')}`;
  let inLines = false;
  return text
    .split('\n')
    .map((line) => {
      if (/^\S/.test(line)) inLines = /^lines:/.test(line);
      let out = line
        .replace(/^id: (\S+)/, (_m, id: string) => `id: ${id}-${tag}`)
        .replace(/^title: (.*)$/, (_m, t: string) => `title: ${t.replace(/^"|"$/g, '')} (${tag})`);
      if (inLines) {
        const shift = (re: RegExp, size: number) => {
          out = out.replace(re, (_m, key: string, num: string) => {
            const decimals = Math.max(2, (num.split('.')[1] ?? '').length);
            return `${key}${(Number(num) + (next() - 0.5) * size).toFixed(decimals)}`;
          });
        };
        shift(/(\bwavelength: )(\d+(?:\.\d+)?)/, 0.1);
        shift(/(\b(?:offset_mm|separation_mm): )(\d+(?:\.\d+)?)/, 0.2);
      }
      return out;
    })
    .join('\n');
}

export function makeArchive(outDir: string, count = 500, seed = 20260314): string[] {
  const demos = readdirSync(DEMO)
    .filter((n) => n.endsWith('.yaml'))
    .sort()
    .map((n) => ({ name: n, text: readFileSync(join(DEMO, n), 'utf8') }));
  const next = mulberry32(seed);
  mkdirSync(outDir, { recursive: true });
  // Recorded profiles the demo sessions name (CSV, FITS) sit beside their copies.
  for (const n of readdirSync(DEMO).filter((x) => !x.endsWith('.yaml')))
    copyFileSync(join(DEMO, n), join(outDir, n));
  const written: string[] = [];
  for (let n = 0; n < count; n++) {
    const demo = demos[n % demos.length] as { name: string; text: string };
    const file = join(outDir, `${String(n).padStart(4, '0')}-${demo.name}`);
    writeFileSync(file, vary(demo.text, n, next));
    written.push(file);
  }
  return written;
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [out, count, seed] = process.argv.slice(2);
  if (!out) {
    process.stderr.write('usage: tsx scripts/make-archive.ts OUT_DIR [N] [SEED]\n');
    process.exit(2);
  }
  const files = makeArchive(out, count ? Number(count) : 500, seed ? Number(seed) : undefined);
  process.stdout.write(`wrote ${files.length} sessions into ${out}\n`);
}
