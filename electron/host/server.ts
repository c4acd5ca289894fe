/**
 * Browser mode: the host served over HTTP on 127.0.0.1 only. A random token, made per run and given
 * to the page in the URL fragment (never sent in a request line), must accompany every API call, and
 * the Host header must name this server (against DNS rebinding), so no other web page can reach the
 * user's files. Static files are the built renderer; nothing remote is ever loaded (see the CSP).
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { randomBytes, timingSafeEqual } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { extname, join, normalize, resolve, sep } from 'node:path';
import type { AddressInfo } from 'node:net';
import { BINARY_RESPONSES, HOST_REQUEST_NAMES, type HostRequestName } from '../contract';
import type { HostService } from './service';

export const TOKEN_HEADER = 'x-daybreak-token';
/**
 * Largest request body, bytes. A whole review file (review.save) or export (export.write) travels in
 * one request: a night of a few hundred events at 60 sites is several MB, so the bound only stops a
 * runaway, not real work (it was 1 MiB, which refused such saves and exports).
 */
const MAX_BODY_BYTES = 256 * 1024 * 1024;

/** The Content-Security-Policy of every page: only this origin, no inline script, no remote anything. */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'", "script-src 'self'", "style-src 'self'", "img-src 'self' data: blob:",
  "connect-src 'self'", "worker-src 'self' blob:", "font-src 'self'", "object-src 'none'",
  "base-uri 'none'", "frame-ancestors 'none'", "form-action 'none'",
].join('; ');

const MIME: Record<string, string> = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript; charset=utf-8', '.css': 'text/css; charset=utf-8',
  '.svg': 'image/svg+xml', '.png': 'image/png', '.json': 'application/json', '.map': 'application/json',
  '.woff2': 'font/woff2',
};

export interface BrowserServer {
  /** The address to open, with the token in the fragment. */
  url: string;
  port: number;
  token: string;
  close(): Promise<void>;
}

export interface BrowserServerOptions {
  service: HostService;
  /** Folder of the built renderer (index.html and assets). */
  staticDir: string;
  /** 0 (default) picks a free port. */
  port?: number;
}

export async function startBrowserServer(opts: BrowserServerOptions): Promise<BrowserServer> {
  const token = randomBytes(32).toString('hex');
  const tokenBytes = Buffer.from(token);
  const staticDir = resolve(opts.staticDir);
  let port = 0;

  const server = createServer((req, res) => {
    handle(req, res).catch((e: unknown) => {
      if (!res.headersSent) send(res, 500, 'text/plain; charset=utf-8', `internal error: ${e instanceof Error ? e.message : e}`);
      else res.destroy();
    });
  });

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    const host = req.headers.host ?? '';
    if (host !== `127.0.0.1:${port}` && host !== `localhost:${port}`) {
      return send(res, 421, 'text/plain; charset=utf-8', 'wrong Host header');
    }
    const origin = req.headers.origin;
    if (origin !== undefined && origin !== `http://127.0.0.1:${port}` && origin !== `http://localhost:${port}`) {
      return send(res, 403, 'text/plain; charset=utf-8', 'foreign origin');
    }
    const url = new URL(req.url ?? '/', `http://${host}`);
    if (url.pathname.startsWith('/api/')) return api(req, res, url.pathname.slice(5));
    if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed');
    return serveStatic(res, url.pathname);
  }

  async function api(req: IncomingMessage, res: ServerResponse, name: string): Promise<void> {
    if (req.method !== 'POST') return send(res, 405, 'text/plain; charset=utf-8', 'method not allowed');
    const given = Buffer.from(String(req.headers[TOKEN_HEADER] ?? ''));
    if (given.length !== tokenBytes.length || !timingSafeEqual(given, tokenBytes)) {
      return send(res, 403, 'text/plain; charset=utf-8', 'missing or wrong token');
    }
    if (!(req.headers['content-type'] ?? '').startsWith('application/json')) {
      return send(res, 415, 'text/plain; charset=utf-8', 'requests are JSON');
    }
    if (!HOST_REQUEST_NAMES.includes(name as HostRequestName)) {
      return sendJson(res, { ok: false, code: 'bad-request', message: `unknown request "${name}"` });
    }
    let body: unknown;
    try {
      body = JSON.parse(await readBody(req));
    } catch (e) {
      return sendJson(res, { ok: false, code: 'bad-request', message: `request body: ${e instanceof Error ? e.message : e}` });
    }
    const result = await opts.service.handle(name as HostRequestName, body);
    if (result.ok && BINARY_RESPONSES.has(name as HostRequestName)) {
      const bytes = result.value as Uint8Array;
      res.writeHead(200, { 'content-type': 'application/octet-stream', 'content-length': bytes.byteLength, ...commonHeaders() });
      res.end(bytes);
      return;
    }
    sendJson(res, result);
  }

  async function serveStatic(res: ServerResponse, pathname: string): Promise<void> {
    const rel = pathname === '/' ? 'index.html' : decodeURIComponent(pathname).replace(/^\/+/, '');
    const full = normalize(join(staticDir, rel));
    if (full !== staticDir && !full.startsWith(staticDir + sep)) return send(res, 403, 'text/plain; charset=utf-8', 'forbidden');
    let bytes: Buffer;
    try {
      bytes = await readFile(full);
    } catch {
      return send(res, 404, 'text/plain; charset=utf-8', 'not found');
    }
    res.writeHead(200, {
      'content-type': MIME[extname(full)] ?? 'application/octet-stream',
      'content-length': bytes.byteLength,
      ...commonHeaders(),
    });
    res.end(bytes);
  }

  await new Promise<void>((ok, fail) => {
    server.once('error', fail);
    server.listen(opts.port ?? 0, '127.0.0.1', () => ok());
  });
  port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/#token=${token}`,
    port,
    token,
    close: () => new Promise<void>((ok) => { server.closeAllConnections(); server.close(() => ok()); }),
  };
}

function commonHeaders(): Record<string, string> {
  return {
    'content-security-policy': CONTENT_SECURITY_POLICY,
    'x-content-type-options': 'nosniff',
    'referrer-policy': 'no-referrer',
    'cache-control': 'no-store',
    'cross-origin-opener-policy': 'same-origin',
    'cross-origin-resource-policy': 'same-origin',
  };
}

function send(res: ServerResponse, status: number, type: string, text: string): void {
  res.writeHead(status, { 'content-type': type, ...commonHeaders() });
  res.end(text);
}

function sendJson(res: ServerResponse, value: unknown): void {
  send(res, 200, 'application/json', JSON.stringify(value));
}

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((ok, fail) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (c: Buffer) => {
      size += c.length;
      if (size > MAX_BODY_BYTES) {
        fail(new Error(`over ${MAX_BODY_BYTES / 1048576} MiB`));
        req.destroy();
      } else chunks.push(c);
    });
    req.on('end', () => ok(Buffer.concat(chunks).toString('utf8')));
    req.on('error', fail);
  });
}
