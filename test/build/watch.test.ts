/** `build --watch` through the real command line: a saved session is rebuilt, Ctrl-C ends it. */
import { spawn } from 'node:child_process';
import { appendFileSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { archive, CLI, tempDir } from './helpers.js';

describe('lineledger build --watch', () => {
  it('rebuilds what changed and stops on SIGINT', async () => {
    const { dir, files } = archive(3);
    const out = join(tempDir('ll-watch-'), 'site');
    const child = spawn(process.execPath, [CLI, 'build', dir, '--out', out, '--watch', '--verbose'], {
      stdio: ['ignore', 'ignore', 'pipe'],
    });
    let stderr = '';
    const waiters: { count: number; resolve: () => void }[] = [];
    const watching = () => stderr.split('watching for changes').length - 1;
    child.stderr.setEncoding('utf8');
    child.stderr.on('data', (c: string) => {
      stderr += c;
      for (const w of waiters) if (watching() >= w.count) w.resolve();
    });
    const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
    const until = (count: number) =>
      new Promise<void>((resolve, reject) => {
        if (watching() >= count) return resolve();
        waiters.push({ count, resolve });
        setTimeout(() => reject(new Error(`no build ${count} in time:\n${stderr}`)), 60_000);
      });
    try {
      await until(1);
      expect(stderr).toContain('0 from the cache, 3 computed');
      const file = files[1] as string;
      appendFileSync(file, '# edited while watching\n');
      await until(2);
      expect(stderr).toContain('2 from the cache, 1 computed');
      expect(stderr).toContain(`${basename(file)}: `);
      const id = /^id: (\S+)/m.exec(readFileSync(file, 'utf8'))?.[1] as string;
      expect(readFileSync(join(out, 'sessions', id, 'session.yaml'), 'utf8')).toContain(
        '# edited while watching',
      );
    } finally {
      child.kill('SIGINT');
    }
    expect(await exited).toBe(0);
  });
});
