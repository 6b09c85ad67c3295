import crypto from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { bridgePathPrefix, tokenHeader } from '../../app/contract/api.js';
import type { Dispatcher } from '../back-end/handlers.js';
import { contentTypeFor, securityHeaders } from '../back-end/security-headers.js';
import { readRendererFile } from '../back-end/static-files.js';

export type LoopbackHost = {
  readonly url: string;
  readonly origin: string;
  readonly port: number;
  readonly token: string;
  close(): Promise<void>;
};

export type LoopbackOptions = {
  /** 0 picks any free port. */
  readonly port: number;
  readonly rendererDirectory: string;
  readonly dispatch: Dispatcher;
  /** Fixed only by tests; a fresh random token per run otherwise. */
  readonly token?: string;
  readonly log?: (message: string) => void;
};

const cookieName = 'tidewing_token';
const maxBodyBytes = 2 * 1024 * 1024;

function sameToken(expected: string, offered: string | undefined): boolean {
  if (offered === undefined) return false;
  const a = Buffer.from(expected);
  const b = Buffer.from(offered);
  return a.length === b.length && crypto.timingSafeEqual(a, b);
}

function cookieToken(header: string | undefined): string | undefined {
  if (header === undefined) return undefined;
  for (const part of header.split(';')) {
    const [name, ...rest] = part.trim().split('=');
    if (name === cookieName) return rest.join('=');
  }
  return undefined;
}

function send(
  response: http.ServerResponse,
  status: number,
  body: string | Buffer,
  contentType: string,
  extra: Record<string, string> = {},
): void {
  response.writeHead(status, { ...securityHeaders, 'content-type': contentType, ...extra });
  response.end(body);
}

function readBody(request: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    request.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > maxBodyBytes) {
        reject(new Error('Request body too large'));
        request.destroy();
        return;
      }
      chunks.push(chunk);
    });
    request.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    request.on('error', reject);
  });
}

/**
 * Serves the built renderer and the contract bridge on 127.0.0.1 only. Every request must carry
 * the per-run token (query on the first page load, then an HttpOnly cookie for files and the
 * token header for bridge calls); the Host header must name this loopback address and port,
 * which defeats DNS rebinding.
 */
export async function startLoopbackHost(options: LoopbackOptions): Promise<LoopbackHost> {
  const token = options.token ?? crypto.randomBytes(24).toString('base64url');
  const log = options.log ?? (() => undefined);
  let allowedHosts = new Set<string>();

  const server = http.createServer((request, response) => {
    void handle(request, response).catch((error: unknown) => {
      log(`Request failed: ${error instanceof Error ? error.message : String(error)}`);
      if (!response.headersSent) send(response, 500, 'Internal error', 'text/plain; charset=utf-8');
      else response.end();
    });
  });

  async function handle(request: http.IncomingMessage, response: http.ServerResponse): Promise<void> {
    const host = request.headers.host;
    if (host === undefined || !allowedHosts.has(host.toLowerCase())) {
      send(
        response,
        421,
        'This Tidewing host answers only on its loopback address.',
        'text/plain; charset=utf-8',
      );
      return;
    }
    const url = new URL(request.url ?? '/', `http://${host}`);
    const headerToken = request.headers[tokenHeader];
    const offeredHeader = typeof headerToken === 'string' ? headerToken : undefined;
    const offeredQuery = url.searchParams.get('token') ?? undefined;
    const offeredCookie = cookieToken(request.headers.cookie);

    if (url.pathname.startsWith(bridgePathPrefix)) {
      // Bridge calls need the header: a cookie alone could be replayed by another page.
      if (!sameToken(token, offeredHeader)) {
        send(
          response,
          403,
          JSON.stringify({
            ok: false,
            error: { code: 'invalid-request', message: 'Missing or wrong access token.' },
          }),
          'application/json; charset=utf-8',
        );
        return;
      }
      if (request.method !== 'POST') {
        send(response, 405, 'Use POST', 'text/plain; charset=utf-8', { allow: 'POST' });
        return;
      }
      const channel = decodeURIComponent(url.pathname.slice(bridgePathPrefix.length));
      let payload: unknown;
      try {
        const text = await readBody(request);
        payload = text === '' ? {} : JSON.parse(text);
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        send(
          response,
          400,
          JSON.stringify({
            ok: false,
            error: { code: 'invalid-request', message: `The request body is not valid JSON: ${message}` },
          }),
          'application/json; charset=utf-8',
        );
        return;
      }
      const result = await options.dispatch(channel, payload);
      send(response, 200, JSON.stringify(result), 'application/json; charset=utf-8');
      return;
    }

    const viaQuery = sameToken(token, offeredQuery);
    if (!viaQuery && !sameToken(token, offeredCookie) && !sameToken(token, offeredHeader)) {
      send(
        response,
        403,
        'Access refused: open the full address Tidewing printed, including its token.',
        'text/plain; charset=utf-8',
      );
      return;
    }
    if (request.method !== 'GET' && request.method !== 'HEAD') {
      send(response, 405, 'Use GET', 'text/plain; charset=utf-8', { allow: 'GET, HEAD' });
      return;
    }
    const file = await readRendererFile(options.rendererDirectory, url.pathname);
    if (file === null) {
      send(response, 404, 'Not found', 'text/plain; charset=utf-8');
      return;
    }
    const extra: Record<string, string> = viaQuery
      ? { 'set-cookie': `${cookieName}=${token}; HttpOnly; SameSite=Strict; Path=/` }
      : {};
    send(
      response,
      200,
      request.method === 'HEAD' ? Buffer.alloc(0) : file.body,
      contentTypeFor(file.extension),
      extra,
    );
  }

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;
  allowedHosts = new Set([`127.0.0.1:${port}`, `localhost:${port}`]);
  const origin = `http://127.0.0.1:${port}`;

  return {
    url: `${origin}/?token=${token}`,
    origin,
    port,
    token,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
