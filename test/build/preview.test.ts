/** The preview server, on 127.0.0.1 with a bounded number of requests, closed at the end. */

import { mkdtempSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  EVENTS_PATH,
  type PreviewServer,
  RELOAD_SCRIPT_PATH,
  RELOAD_SNIPPET,
  startPreview,
} from '../../src/commands/preview.js';
import { cspMeta, PAGE_CSP, PREVIEW_CSP, PREVIEW_CSP_HEADER } from '../../src/report/csp.js';
import { applyPatch } from '../../src/write/patch.js';
import { writeSiteAtomically } from '../../src/write/writeSite.js';
import { tempDir } from './helpers.js';

const PAGE = '<!doctype html>\n<html><body><p>record</p></body></html>\n';
/** A page as the layout writes it, with its own CSP <meta>. */
const POLICED_PAGE = `<!doctype html>\n<html><head>${cspMeta(PAGE_CSP)}</head><body><p>record</p></body></html>\n`;

interface Reply {
  status: number;
  type: string | undefined;
  location: string | undefined;
  csp: string | undefined;
  body: string;
}

/** One raw request (the path is sent as given: no client-side normalisation of `..`). */
function get(
  server: PreviewServer,
  path: string,
  method = 'GET',
  headers: Record<string, string> = {},
): Promise<Reply> {
  const url = new URL(server.url);
  return new Promise((resolve, reject) => {
    const req = request(
      { host: url.hostname, port: url.port, path, method, headers, timeout: 5000 },
      (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (c: string) => {
          body += c;
        });
        res.on('end', () =>
          resolve({
            status: res.statusCode ?? 0,
            type: res.headers['content-type'],
            location: res.headers.location,
            csp: res.headers['content-security-policy'] as string | undefined,
            body,
          }),
        );
      },
    );
    req.on('timeout', () => req.destroy(new Error('timed out')));
    req.on('error', reject);
    req.end();
  });
}

describe('lineledger preview', () => {
  const parent = tempDir('ll-preview-');
  const root = join(parent, 'site');
  let server: PreviewServer;

  beforeAll(async () => {
    writeFileSync(join(parent, 'secret.txt'), 'outside the site\n');
    writeSiteAtomically(root, [
      { path: 'index.html', contents: PAGE },
      { path: 'style.css', contents: 'p { color: black }\n' },
      { path: 'sessions/a/index.html', contents: PAGE },
      { path: 'sessions/a/result.json', contents: '{}\n' },
      { path: 'sessions/a/lines.csv', contents: 'index\n0\n' },
      { path: 'sessions/b/result.json', contents: '{}\n' },
      { path: 'sessions/c/index.html', contents: POLICED_PAGE },
    ]);
    // A symbolic link inside the site that points out of it.
    symlinkSync(join(parent, 'secret.txt'), join(root, 'link.txt'));
    server = await startPreview({ root, host: '127.0.0.1', port: 0 });
  });
  afterAll(async () => {
    await server.close();
  });

  it('listens on 127.0.0.1', () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
  });

  it('serves HTML with the reload snippet, and the file on disk stays without it', async () => {
    const r = await get(server, '/');
    expect(r.status).toBe(200);
    expect(r.type).toBe('text/html; charset=utf-8');
    expect(r.body).toContain(RELOAD_SNIPPET);
    expect(r.body.indexOf(RELOAD_SNIPPET)).toBeLessThan(r.body.indexOf('</body>'));
    const page = await get(server, '/sessions/a/');
    expect(page.body).toContain(RELOAD_SNIPPET);
    expect(readFileSync(join(root, 'index.html'), 'utf8')).toBe(PAGE);
    expect(readFileSync(join(root, 'sessions/a/index.html'), 'utf8')).not.toMatch(/<script/i);
  });

  it('gives each file its content type and leaves non-HTML untouched', async () => {
    const css = await get(server, '/style.css');
    expect([css.status, css.type, css.body]).toEqual([
      200,
      'text/css; charset=utf-8',
      'p { color: black }\n',
    ]);
    expect((await get(server, '/sessions/a/result.json')).type).toBe('application/json; charset=utf-8');
    expect((await get(server, '/sessions/a/lines.csv')).type).toBe('text/csv; charset=utf-8');
  });

  it('refuses paths outside the site folder', async () => {
    for (const path of [
      '/../secret.txt',
      '/%2e%2e/secret.txt',
      '/sessions/..%2f..%2fsecret.txt',
      '/sessions/%2e%2e/%2e%2e/secret.txt',
      '/..%5csecret.txt',
      '/%00',
      '/link.txt',
    ]) {
      const r = await get(server, path);
      expect(r.status, path).toBe(404);
      expect(r.body, path).not.toContain('outside the site');
    }
  });

  it('lists no folders: a folder is its index.html, or not found', async () => {
    expect((await get(server, '/sessions/b/')).status).toBe(404);
    expect((await get(server, '/sessions/')).status).toBe(404);
    const r = await get(server, '/sessions/a');
    expect([r.status, r.location]).toEqual([301, '/sessions/a/']);
    expect((await get(server, '/', 'POST')).status).toBe(405);
  });

  it('never redirects to a protocol-relative URL: empty path segments are dropped', async () => {
    // `//sessions/a` once answered `Location: //sessions/a/`, which a browser reads as the host
    // "sessions" (RFC 3986 §4.2, network-path reference).
    for (const path of ['//sessions/a', '///sessions//a', '/sessions//a']) {
      const r = await get(server, path);
      expect([r.status, r.location], path).toEqual([301, '/sessions/a/']);
    }
  });

  it('answers only to a loopback Host header (DNS rebinding)', async () => {
    const port = new URL(server.url).port;
    for (const host of [
      'evil.example',
      `evil.example:${port}`,
      `127.0.0.1:${Number(port) + 1}`,
      '127.0.0.1',
    ]) {
      const r = await get(server, '/', 'GET', { Host: host });
      expect(r.status, host).toBe(403);
      expect(r.body, host).not.toContain('record');
    }
    for (const host of [`127.0.0.1:${port}`, `localhost:${port}`, `LOCALHOST:${port}`]) {
      expect((await get(server, '/', 'GET', { Host: host })).status, host).toBe(200);
    }
    const events = await get(server, EVENTS_PATH, 'GET', { Host: 'evil.example' });
    expect(events.status).toBe(403);
  });

  it('sends a Content-Security-Policy on every response and serves its reload script from its own origin', async () => {
    for (const path of ['/', '/style.css', '/sessions/a', '/missing', RELOAD_SCRIPT_PATH]) {
      expect((await get(server, path)).csp, path).toBe(PREVIEW_CSP_HEADER);
    }
    expect(RELOAD_SNIPPET).not.toMatch(/<script>/);
    const script = await get(server, RELOAD_SCRIPT_PATH);
    expect([script.status, script.type]).toEqual([200, 'text/javascript; charset=utf-8']);
    expect(script.body).toContain(EVENTS_PATH);
    // The page's own <meta> policy is widened as served (both policies apply), never on disk.
    const served = await get(server, '/sessions/c/');
    expect(served.body).toContain(cspMeta(PREVIEW_CSP));
    expect(served.body).not.toContain(cspMeta(PAGE_CSP));
    expect(readFileSync(join(root, 'sessions/c/index.html'), 'utf8')).toBe(POLICED_PAGE);
  });

  /** Connects to the event stream, runs `rebuild` once connected, and waits for the reload. */
  const reloadAfter = async (rebuild: () => void) => {
    const url = new URL(server.url);
    const message = await new Promise<string>((resolve, reject) => {
      const req = request({ host: url.hostname, port: url.port, path: EVENTS_PATH }, (res) => {
        expect(res.headers['content-type']).toBe('text/event-stream');
        let seen = '';
        res.setEncoding('utf8');
        res.on('data', (c: string) => {
          seen += c;
          if (seen.includes(': listening')) {
            // Connected: now rebuild, as `lineledger build` does.
            if (!seen.includes('rebuilt')) {
              seen += ' rebuilt';
              rebuild();
            }
          }
          if (seen.includes('data: reload')) {
            req.destroy();
            resolve(seen);
          }
        });
      });
      req.setTimeout(10_000, () => req.destroy(new Error('no reload event')));
      req.on('error', reject);
      req.end();
    });
    expect(message).toContain('data: reload');
  };

  it('tells an open page to reload when a rebuild swaps the site in', () =>
    reloadAfter(() => writeSiteAtomically(root, [{ path: 'index.html', contents: PAGE }])));

  it('tells an open page to reload when a rebuild patches the site in place', () =>
    reloadAfter(() => {
      const staging = mkdtempSync(join(parent, '.staging-'));
      writeFileSync(join(staging, 'index.html'), PAGE);
      applyPatch(root, { staging, written: ['index.html'], removed: [] }, false);
    }));
});
