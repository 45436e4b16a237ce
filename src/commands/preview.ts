/**
 * `lineledger preview [DIR]`: serves a built site with node:http, on 127.0.0.1 unless told
 * otherwise, and reloads open pages after a rebuild. The site's pages carry no script; the
 * reload snippet is added only to HTML as it is served (never to the files on disk) and listens
 * for Server-Sent Events on /__lineledger/events. A rebuild is seen in the site's parent folder:
 * as the swap of the site folder (the write edge renames a finished build into place) or as
 * the marker of a patch in place coming and going.
 */
import { type FSWatcher, readFileSync, realpathSync, statSync, watch } from 'node:fs';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { basename, dirname, extname, join, relative, resolve, sep } from 'node:path';
import type { Command } from 'commander';
import { cspMeta, PAGE_CSP, PREVIEW_CSP, PREVIEW_CSP_HEADER } from '../report/csp.js';
import { patchMarkerPrefix } from '../write/patch.js';
import { CommandFailure, EXIT_OK, loadConfig } from './common.js';

export const EVENTS_PATH = '/__lineledger/events';

/** The reload script, served from the preview's own origin so the page's CSP need allow no inline script. */
export const RELOAD_SCRIPT_PATH = '/__lineledger/reload.js';

const RELOAD_SCRIPT = `/* lineledger preview only */(()=>{const e=new EventSource(${JSON.stringify(EVENTS_PATH)});e.onmessage=()=>location.reload();})();\n`;

export const RELOAD_SNIPPET = `<script src="${RELOAD_SCRIPT_PATH}"></script>`;

const CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.yaml': 'application/yaml; charset=utf-8',
  '.yml': 'application/yaml; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.pdf': 'application/pdf',
  '.txt': 'text/plain; charset=utf-8',
  '.tsv': 'text/tab-separated-values; charset=utf-8',
  '.fits': 'application/fits',
  '.fit': 'application/fits',
  '.fts': 'application/fits',
  '.js': 'text/javascript; charset=utf-8',
};

/** At most this many pages listening for reloads at once (each holds a connection). */
const MAX_LISTENERS = 64;

export interface PreviewOptions {
  root: string;
  host?: string;
  port?: number;
  /** Watch for rebuilds (default true). */
  watch?: boolean;
}

export interface PreviewServer {
  url: string;
  /** Tell open pages to reload (called on a rebuild). */
  reload(): void;
  close(): Promise<void>;
}

/**
 * Adds the reload snippet before the last </body>, or at the end, and widens the page's own CSP
 * <meta> to the preview's (a <meta> policy and a header policy both apply, so the page's
 * `default-src 'none'` would otherwise block the reload script).
 */
export function injectReload(html: string): string {
  const widened = html.replace(cspMeta(PAGE_CSP), cspMeta(PREVIEW_CSP));
  const at = widened.lastIndexOf('</body>');
  return at < 0 ? widened + RELOAD_SNIPPET : widened.slice(0, at) + RELOAD_SNIPPET + widened.slice(at);
}

/**
 * Whether a request's Host header names this server by a loopback name. A page on another site
 * can make a browser resolve its own name to 127.0.0.1 (DNS rebinding) and read the preview;
 * checking Host refuses that. Only applied when the server itself listens on loopback: a
 * server the user opened to the network is reached under names it cannot know.
 */
export function isLoopbackHost(hostHeader: string | undefined, port: number): boolean {
  if (hostHeader === undefined) return false;
  const host = hostHeader.toLowerCase();
  // A browser leaves out the port when it is the scheme's default (RFC 9110 §7.2).
  return ['127.0.0.1', 'localhost', '[::1]'].some(
    (name) => host === `${name}:${port}` || (port === 80 && host === name),
  );
}

/** Path segments of a URL path with empty ones (`//`) dropped, re-encoded: safe for a Location. */
function canonicalPath(segments: readonly string[]): string {
  return `/${segments.map((s) => encodeURIComponent(s)).join('/')}`;
}

/**
 * The file a URL path names inside root, or null when it would leave root (`..`, encoded
 * separators, symbolic links pointing out), names a hidden entry, or does not exist.
 */
export function resolveInside(
  root: string,
  urlPath: string,
): { file: string; isDir: boolean; canonical: string } | null {
  let path: string;
  try {
    path = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (path.includes('\0') || path.includes('\\')) return null;
  const segments = path.split('/').filter((s) => s !== '');
  if (segments.some((s) => s === '..' || s.startsWith('.'))) return null;
  try {
    // Inside the try: for an instant during a rebuild's swap the site folder does not exist.
    const realRoot = realpathSync(root);
    const target = resolve(realRoot, ...segments);
    const real = realpathSync(target);
    const rel = relative(realRoot, real);
    if (rel.startsWith('..') || resolve(realRoot, rel) !== real) return null;
    return { file: real, isDir: statSync(real).isDirectory(), canonical: canonicalPath(segments) };
  } catch {
    return null;
  }
}

/** Headers every response carries, whatever its status. */
const COMMON_HEADERS = {
  'Cache-Control': 'no-store',
  'X-Content-Type-Options': 'nosniff',
  'Content-Security-Policy': PREVIEW_CSP_HEADER,
  'Referrer-Policy': 'no-referrer',
} as const;

function send(res: ServerResponse, status: number, type: string, body: string | Buffer, head: boolean): void {
  res.writeHead(status, {
    ...COMMON_HEADERS,
    'Content-Type': type,
    'Content-Length': Buffer.byteLength(body),
  });
  res.end(head ? undefined : body);
}

export function startPreview(options: PreviewOptions): Promise<PreviewServer> {
  const root = resolve(options.root);
  const listeners = new Set<ServerResponse>();
  let checkHost: ((host: string | undefined) => boolean) | null = null;

  const handle = (req: IncomingMessage, res: ServerResponse) => {
    const head = req.method === 'HEAD';
    if (checkHost && !checkHost(req.headers.host))
      return send(res, 403, 'text/plain; charset=utf-8', 'this preview answers only to localhost\n', head);
    if (req.method !== 'GET' && !head) {
      res.setHeader('Allow', 'GET, HEAD');
      return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed\n', false);
    }
    const pathname = (req.url ?? '/').split('?')[0] ?? '/';
    if (pathname === EVENTS_PATH) {
      if (listeners.size >= MAX_LISTENERS) return send(res, 503, 'text/plain; charset=utf-8', 'busy\n', head);
      res.writeHead(200, {
        ...COMMON_HEADERS,
        'Content-Type': 'text/event-stream',
        Connection: 'keep-alive',
      });
      res.write(': listening for rebuilds\n\n');
      listeners.add(res);
      req.on('close', () => listeners.delete(res));
      return;
    }
    if (pathname === RELOAD_SCRIPT_PATH)
      return send(res, 200, CONTENT_TYPES['.js'] as string, RELOAD_SCRIPT, head);
    const found = resolveInside(root, pathname);
    if (!found) return send(res, 404, 'text/plain; charset=utf-8', 'not found\n', head);
    let file = found.file;
    if (found.isDir) {
      if (!pathname.endsWith('/')) {
        // The canonical path, never the raw one: `//host` would be a protocol-relative URL.
        res.writeHead(301, {
          ...COMMON_HEADERS,
          Location: `${found.canonical.replace(/\/$/, '')}/`,
          'Content-Length': 0,
        });
        return res.end();
      }
      // No listings: a folder is its index.html or nothing.
      file = join(file, 'index.html');
    }
    let body: Buffer;
    try {
      body = readFileSync(file);
    } catch {
      return send(res, 404, 'text/plain; charset=utf-8', 'not found\n', head);
    }
    const type = CONTENT_TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream';
    if (type.startsWith('text/html')) return send(res, 200, type, injectReload(body.toString('utf8')), head);
    return send(res, 200, type, body, head);
  };

  const server = createServer((req, res) => {
    try {
      handle(req, res);
    } catch {
      if (!res.headersSent) send(res, 500, 'text/plain; charset=utf-8', 'internal error\n', false);
      else res.destroy();
    }
  });
  // Bounded: slow or stalled requests are cut off (the event stream is a response, not a request).
  server.requestTimeout = 10_000;
  server.headersTimeout = 5_000;
  server.maxHeadersCount = 50;

  const reload = () => {
    for (const res of listeners) res.write('data: reload\n\n');
  };
  let watcher: FSWatcher | null = null;
  let timer: NodeJS.Timeout | undefined;
  if (options.watch !== false) {
    // A swap renames the site folder; a patch makes and removes its marker beside it.
    const marker = patchMarkerPrefix(root);
    watcher = watch(dirname(root), (_event, name) => {
      const seen = name?.toString() ?? '';
      if (seen !== basename(root) && !seen.startsWith(marker)) return;
      clearTimeout(timer);
      timer = setTimeout(reload, 100);
    });
  }

  return new Promise((resolveStart, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 8080, options.host ?? '127.0.0.1', () => {
      const address = server.address() as AddressInfo;
      const host = address.family === 'IPv6' ? `[${address.address}]` : address.address;
      if (['127.0.0.1', '::1', 'localhost'].includes(options.host ?? '127.0.0.1'))
        checkHost = (header) => isLoopbackHost(header, address.port);
      resolveStart({
        url: `http://${host}:${address.port}/`,
        reload,
        close: () =>
          new Promise<void>((done) => {
            clearTimeout(timer);
            watcher?.close();
            for (const res of listeners) res.end();
            listeners.clear();
            server.close(() => done());
            server.closeAllConnections();
          }),
      });
    });
  });
}

interface PreviewFlags {
  port?: string;
  host?: string;
  config?: string;
}

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost']);

async function preview(dirArg: string | undefined, opts: PreviewFlags): Promise<number> {
  const config = loadConfig(opts.config);
  const root = resolve(dirArg ?? config.outDir ?? 'site');
  try {
    if (!statSync(root).isDirectory()) throw new Error('not a folder');
  } catch {
    throw new CommandFailure(`there is no built site in ${root}: run lineledger build first`);
  }
  const port = Number(opts.port ?? '8080');
  if (!Number.isInteger(port) || port < 0 || port > 65535)
    throw new CommandFailure(`--port takes a number from 0 to 65535 (got "${opts.port}")`);
  const host = opts.host ?? '127.0.0.1';
  if (!LOOPBACK.has(host))
    process.stderr.write(`lineledger: warning: serving on ${host}, reachable from other machines\n`);
  const server = await startPreview({ root, host, port }).catch((e: Error) => {
    throw new CommandFailure(`cannot serve on ${host}:${port}: ${e.message}`);
  });
  process.stderr.write(
    `lineledger: serving ${root.split(sep).slice(-2).join(sep)} at ${server.url} (Ctrl-C to stop)\n`,
  );
  await new Promise<void>((stop) => {
    const end = () => {
      process.off('SIGINT', end);
      process.off('SIGTERM', end);
      stop();
    };
    process.on('SIGINT', end);
    process.on('SIGTERM', end);
  });
  await server.close();
  return EXIT_OK;
}

export function registerPreview(program: Command, done: (code: number) => void): void {
  program
    .command('preview')
    .description('serve a built site locally, reloading open pages after each rebuild')
    .argument('[dir]', 'the built site (default: out: in lineledger.yaml, else site)')
    .option('--port <n>', 'port to listen on', '8080')
    .option(
      '--host <address>',
      'address to listen on (other than loopback, others can reach it)',
      '127.0.0.1',
    )
    .option('--config <file>', 'project config (default: ./lineledger.yaml when present)')
    .action(async (dir: string | undefined, opts: PreviewFlags) => done(await preview(dir, opts)));
}
