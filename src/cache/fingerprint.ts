/**
 * The program's fingerprint: a hash of its own code files and package.json (which pins every
 * dependency exactly). A changed renderer or scorer must not be hidden by cached pages of the
 * old one, even when the version number was not bumped.
 */
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

function codeFiles(dir: string): string[] {
  const out: string[] = [];
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, e.name);
    if (e.isDirectory()) out.push(...codeFiles(p));
    else if (/\.(js|ts|mjs|cjs)$/.test(e.name)) out.push(p);
  }
  return out;
}

let memo: string | undefined;

export function programFingerprint(): string {
  if (memo !== undefined) return memo;
  // This file sits in <code>/cache/; <code> is src/ (run from source) or dist/ (installed).
  const code = resolve(dirname(fileURLToPath(import.meta.url)), '..');
  const hash = createHash('sha256');
  for (const f of codeFiles(code).sort()) hash.update(`${f.slice(code.length)}\n`).update(readFileSync(f));
  try {
    hash.update(readFileSync(join(code, '..', 'package.json')));
  } catch {
    hash.update('no package.json');
  }
  memo = hash.digest('hex');
  return memo;
}
