/** Shared by the guard tests: a throwaway project, the CLI, and a full picture of a folder tree. */
import { spawnSync } from 'node:child_process';
import {
  copyFileSync,
  lstatSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  readlinkSync,
  realpathSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';

export const CLI = join(process.cwd(), 'dist', 'cli.js');
export const SESSION = join(process.cwd(), 'data', 'sessions', '2026-03-14-tube-b.yaml');

export interface Run {
  code: number | null;
  stdout: string;
  stderr: string;
}

export function lineledger(args: readonly string[], cwd: string, env: NodeJS.ProcessEnv = {}): Run {
  const r = spawnSync(process.execPath, [CLI, ...args], {
    cwd,
    encoding: 'utf8',
    maxBuffer: 256 * 1024 * 1024,
    env: { ...process.env, SOURCE_DATE_EPOCH: '1767225600', ...env },
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/**
 * Every entry under root, dotfiles included: folders, files with their bytes (base64) and
 * links with their targets. Equal before and after a command = nothing deleted or changed.
 */
export function tree(root: string): Record<string, string> {
  const out: Record<string, string> = {};
  const walk = (d: string) => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      const rel = relative(root, p);
      const s = lstatSync(p);
      if (s.isSymbolicLink()) out[rel] = `link → ${readlinkSync(p)}`;
      else if (s.isDirectory()) {
        out[rel] = 'folder';
        walk(p);
      } else out[rel] = `file ${readFileSync(p).toString('base64')}`;
    }
  };
  walk(root);
  return out;
}

/** /tmp/…/p with sessions/ (one session), notes.txt, and nothing else. */
export function project(): string {
  const root = join(realpathSync(mkdtempSync(join(tmpdir(), 'll-guard-'))), 'p');
  mkdirSync(join(root, 'sessions'), { recursive: true });
  copyFileSync(SESSION, join(root, 'sessions', '2026-03-14-tube-b.yaml'));
  writeFileSync(join(root, 'notes.txt'), 'keep\n');
  return root;
}

/** A refusal: exit 2, the reason given, no stack trace. */
export function expectRefused(r: Run, reason: RegExp): void {
  if (r.code !== 2 || !reason.test(r.stderr))
    throw new Error(`expected a refusal ${reason}, got ${r.code}: ${r.stderr}`);
  if (/internal error|\n\s+at /.test(r.stderr)) throw new Error(`stack trace printed: ${r.stderr}`);
}
