/** The program's version, from package.json (read once; the value goes into every record). */
import { readFileSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

function readVersion(): string {
  const path = resolve(dirname(fileURLToPath(import.meta.url)), '..', 'package.json');
  const pkg = JSON.parse(readFileSync(path, 'utf8')) as { version?: string };
  return pkg.version ?? '0.0.0';
}

export const PROGRAM_VERSION = readVersion();
