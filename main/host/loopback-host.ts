import crypto from 'node:crypto';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { bridgePathPrefix, tokenHeader, tokenMetaName } from '../../app/contract/api.js';
import type { Dispatcher } from '../back-end/handlers.js';
import { changeStreamPath } from '../../app/contract/change-notices.js';
import type { ChangeSource } from '../back-end/change-notices.js';
import { ChangeStreams } from './change-stream.js';
import { contentTypeFor, securityHeaders } from '../back-end/security-headers.js';
import { readRendererFile, withPageTheme } from '../back-end/static-files.js';
import {
  cacheControlFor,
  chooseEncoding,
  compressible,
  EncodedAssets,
  smallestCompressedBytes,
} from './asset-encoding.js';

export type LoopbackHost = {
  /**
   * The first one-time start address (`http://127.0.0.1:PORT/?start=CODE`): printed and given to
   * the browser. It works once; afterwards it is refused.
   */
  readonly url: string;
  readonly origin: string;
  readonly port: number;
  /** The bridge token, for in-process callers and tests; never printed, never in an address. */
  readonly token: string;
  /** Issues another one-time start address, for another tab or browser. */
  newStartUrl(): string;
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
  /** The workstation's pinned theme, written into the app's page; the system's when not given. */
  readonly pageTheme?: () => 'system' | 'light' | 'dim';
  /** Called each time a start address is used (after its session is set up). */
  readonly onStartAddressUsed?: () => void;
  /** Change notices streamed to the pages at `changeStreamPath` (Server-Sent Events). */
  readonly changes?: Pick<ChangeSource, 'subscribe'>;
};

/** Largest bridge request body, bytes (a plan with its snapshot is a few hundred KiB at most). */
export const maxBodyBytes = 2 * 1024 * 1024;
const startParameter = 'start';
const textType = 'text/plain; charset=utf-8';
const jsonType = 'application/json; charset=utf-8';

function randomSecret(): string {
  return crypto.randomBytes(24).toString('base64url');
}

function sameSecret(expected: string, offered: string | undefined): boolean {
  if (offered === undefined) return false;
  const a = Buffer.from(expected);
  const b = Buffer.from(offered);
  return a.length === b.length && crypto.timingSafeEqual(a, b);
}

function cookieValue(header: string | undefined, name: string): string | undefined {
  if (header === undefined) return undefined;
  for (const part of header.split(';')) {
    const [key, ...rest] = part.trim().split('=');
    if (key === name) return rest.join('=');
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

function sendBridgeError(response: http.ServerResponse, status: number, message: string): void {
  send(
    response,
    status,
    JSON.stringify({ ok: false, error: { code: 'invalid-request', message } }),
    jsonType,
  );
}

class BodyTooLargeError extends Error {}

/**
 * Reads a request body of at most `maxBodyBytes`. Past the limit it stops keeping the bytes but
 * goes on reading (and discarding) them, so the 413 answer reaches the client instead of a
 * connection reset.
 */
function readBody(request: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    let tooLarge = false;
    request.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (tooLarge) return;
      if (size > maxBodyBytes) {
        tooLarge = true;
        chunks.length = 0;
        reject(new BodyTooLargeError());
        return;
      }
      chunks.push(chunk);
    });
    request.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    request.on('error', reject);
  });
}

/** Puts the bridge token into the page's head as a `<meta>` element the bridge reads once. */
function withToken(html: Buffer, token: string): Buffer {
  const text = html.toString('utf8');
  const meta = `<meta name="${tokenMetaName}" content="${token}" />`;
  const head = /<head[^>]*>/i.exec(text);
  if (head === null) return Buffer.from(`${meta}${text}`, 'utf8');
  const at = head.index + head[0].length;
  return Buffer.from(`${text.slice(0, at)}${meta}${text.slice(at)}`, 'utf8');
}

/** One use of a start code: the page it opens may take the bridge token once, soon after. */
type Session = { tokenHandedOver: boolean; readonly handOverUntilMs: number };

/** How long after a start code is used its page may still take the token, ms (a slow browser start). */
const handOverWindowMs = 2 * 60 * 1000;

/**
 * Serves the built renderer and the contract bridge on 127.0.0.1 only.
 * - The address it prints carries a one-time start code. Its first use sets a cookie (a separate
 *   random value, named after the port, good only for the app's files) and redirects to the
 *   clean address; the page loaded next gets the bridge token inside its HTML. A used code is
 *   refused, so what a process list or a browser command line shows is useless once opened.
 * - Bridge calls (`POST /api/<channel>`) need the token header, and an Origin, when the browser
 *   sends one, equal to this host's own origin; so a page of another local server (which the
 *   browser also sends our cookie to) can do nothing with it.
 * - The Host header must name this loopback address and port (defeats DNS rebinding).
 * - Malformed addresses answer 400, bodies over `maxBodyBytes` 413.
 */
export async function startLoopbackHost(options: LoopbackOptions): Promise<LoopbackHost> {
  const token = options.token ?? randomSecret();
  const log = options.log ?? (() => undefined);
  let allowedHosts = new Set<string>();
  let allowedOrigins = new Set<string>();
  let cookieName = '';
  let origin = '';
  const unusedStartCodes = new Set<string>();
  const usedStartCodes = new Set<string>();
  // Keyed by the cookie value; each use of a start code opens one session.
  const sessions = new Map<string, Session>();
  const encodedAssets = new EncodedAssets();
  const changeStreams = new ChangeStreams(options.changes);

  const server = http.createServer((request, response) => {
    void handle(request, response).catch((error: unknown) => {
      log(`Request failed: ${error instanceof Error ? error.message : String(error)}`);
      if (!response.headersSent) send(response, 500, 'Internal error', textType);
      else response.end();
    });
  });

  function sessionOf(request: http.IncomingMessage): Session | undefined {
    const offered = cookieValue(request.headers.cookie, cookieName);
    if (offered === undefined) return undefined;
    for (const [key, session] of sessions) if (sameSecret(key, offered)) return session;
    return undefined;
  }

  async function handle(request: http.IncomingMessage, response: http.ServerResponse): Promise<void> {
    const host = request.headers.host;
    if (host === undefined || !allowedHosts.has(host.toLowerCase())) {
      send(response, 421, 'This Tidewing host answers only on its loopback address.', textType);
      return;
    }
    const target = request.url ?? '';
    let url: URL;
    try {
      if (!target.startsWith('/')) throw new Error('not a path');
      // Joined rather than resolved, so that `//name/...` stays a path and never becomes a host.
      url = new URL(`${origin}${target}`);
      decodeURIComponent(url.pathname);
    } catch {
      send(response, 400, 'Malformed address: check the percent-encoding of the path.', textType);
      return;
    }

    if (url.pathname === changeStreamPath) {
      if (refuseWithoutBridgeAccess(request, response)) return;
      changeStreams.open(request, response);
      return;
    }
    if (url.pathname.startsWith(bridgePathPrefix)) {
      await bridgeCall(request, response, decodeURIComponent(url.pathname.slice(bridgePathPrefix.length)));
      return;
    }

    if (request.method !== 'GET' && request.method !== 'HEAD') {
      send(response, 405, 'Use GET', textType, { allow: 'GET, HEAD' });
      return;
    }
    const startCode = url.searchParams.get(startParameter);
    if (startCode !== null) {
      // Only a page load spends the code, not a HEAD from a link checker or preview.
      if (request.method !== 'GET') {
        send(response, 405, 'Open this address in a browser.', textType, { allow: 'GET' });
        return;
      }
      useStartCode(response, url, startCode);
      return;
    }
    const session = sessionOf(request);
    if (session === undefined) {
      send(
        response,
        403,
        'Access refused: open the one-time address Tidewing printed in its terminal (each address works once; Tidewing prints the next one after each use).',
        textType,
      );
      return;
    }
    const file = await readRendererFile(options.rendererDirectory, url.pathname);
    if (file === null) {
      send(response, 404, 'Not found', textType);
      return;
    }
    let body =
      file.extension === '.html' ? withPageTheme(file, options.pageTheme?.() ?? 'system') : file.body;
    let carriesToken = false;
    if (
      file.extension === '.html' &&
      request.method === 'GET' &&
      !session.tokenHandedOver &&
      Date.now() <= session.handOverUntilMs
    ) {
      // Only the first page after the start address gets the token; it keeps it for its tab.
      session.tokenHandedOver = true;
      body = withToken(body, token);
      carriesToken = true;
    }
    // The page with the token goes uncompressed: no secret in a compressed stream.
    await sendFile(request, response, url.pathname, body, contentTypeFor(file.extension), !carriesToken);
  }

  /**
   * A renderer file: hashed assets cacheable for a year, the rest never kept; compressed when the
   * browser accepts it (Content-Length is that of the bytes sent; a HEAD gets the same headers).
   */
  async function sendFile(
    request: http.IncomingMessage,
    response: http.ServerResponse,
    urlPath: string,
    body: Buffer,
    contentType: string,
    mayCompress: boolean,
  ): Promise<void> {
    const headers: Record<string, string> = { 'cache-control': cacheControlFor(urlPath) };
    let sent = body;
    if (compressible(contentType)) {
      headers['vary'] = 'Accept-Encoding';
      const encoding =
        mayCompress && body.length >= smallestCompressedBytes
          ? chooseEncoding(request.headers['accept-encoding'])
          : null;
      if (encoding !== null) {
        sent = await encodedAssets.get(urlPath, body, encoding);
        headers['content-encoding'] = encoding;
      }
    }
    headers['content-length'] = String(sent.length);
    response.writeHead(200, { ...securityHeaders, 'content-type': contentType, ...headers });
    response.end(request.method === 'HEAD' ? undefined : sent);
  }

  function useStartCode(response: http.ServerResponse, url: URL, offered: string): void {
    let known: string | undefined;
    for (const code of unusedStartCodes) if (sameSecret(code, offered)) known = code;
    if (known === undefined) {
      const used = [...usedStartCodes].some((code) => sameSecret(code, offered));
      send(
        response,
        403,
        used
          ? 'This one-time address has already been used. Open the newest address Tidewing printed in its terminal. If you did not open this one yourself, stop Tidewing (Ctrl+C) and start it again.'
          : 'This start address is not valid for this Tidewing. Open the address it printed in its terminal.',
        textType,
      );
      return;
    }
    unusedStartCodes.delete(known);
    usedStartCodes.add(known);
    const fileKey = randomSecret();
    sessions.set(fileKey, { tokenHandedOver: false, handOverUntilMs: Date.now() + handOverWindowMs });
    url.searchParams.delete(startParameter);
    const search = url.searchParams.toString();
    send(response, 303, 'Opening Tidewing…', textType, {
      location: `${url.pathname}${search === '' ? '' : `?${search}`}`,
      'set-cookie': `${cookieName}=${fileKey}; HttpOnly; SameSite=Strict; Path=/`,
    });
    options.onStartAddressUsed?.();
  }

  async function bridgeCall(
    request: http.IncomingMessage,
    response: http.ServerResponse,
    channel: string,
  ): Promise<void> {
    // A declared oversize body is refused before anything else, and read to its end unkept.
    const declaredLength = Number(request.headers['content-length'] ?? 0);
    if (declaredLength > maxBodyBytes) {
      sendTooLarge(response);
      request.resume();
      return;
    }
    if (refuseWithoutBridgeAccess(request, response)) return;
    if (request.method !== 'POST') {
      send(response, 405, 'Use POST', textType, { allow: 'POST' });
      return;
    }
    let payload: unknown;
    try {
      const text = await readBody(request);
      payload = text === '' ? {} : JSON.parse(text);
    } catch (error) {
      if (error instanceof BodyTooLargeError) {
        sendTooLarge(response);
        return;
      }
      const message = error instanceof Error ? error.message : String(error);
      sendBridgeError(response, 400, `The request body is not valid JSON: ${message}`);
      return;
    }
    const result = await options.dispatch(channel, payload);
    send(response, 200, JSON.stringify(result), jsonType);
  }

  /** Answers 403 (and says true) unless the call carries the token and comes from our own page. */
  function refuseWithoutBridgeAccess(request: http.IncomingMessage, response: http.ServerResponse): boolean {
    // Bridge calls need the header: a cookie alone could be replayed by another page.
    const headerToken = request.headers[tokenHeader];
    if (!sameSecret(token, typeof headerToken === 'string' ? headerToken : undefined)) {
      sendBridgeError(response, 403, 'Missing or wrong access token.');
      return true;
    }
    const requestOrigin = request.headers.origin;
    const fetchSite = request.headers['sec-fetch-site'];
    if (
      (requestOrigin !== undefined && !allowedOrigins.has(requestOrigin.toLowerCase())) ||
      (fetchSite !== undefined && fetchSite !== 'same-origin')
    ) {
      sendBridgeError(response, 403, 'Calls from another web page are refused.');
      return true;
    }
    return false;
  }

  function sendTooLarge(response: http.ServerResponse): void {
    sendBridgeError(
      response,
      413,
      `The request is larger than ${maxBodyBytes / 1024 / 1024} MiB and was not read. Shorten the text in it and try again.`,
    );
  }

  function newStartUrl(): string {
    const code = randomSecret();
    unusedStartCodes.add(code);
    return `${origin}/?${startParameter}=${code}`;
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
  allowedOrigins = new Set([`http://127.0.0.1:${port}`, `http://localhost:${port}`]);
  // Browsers send a host's cookies to every port on it: one name per port keeps two instances
  // in one browser apart.
  cookieName = `tidewing_files_${port}`;
  origin = `http://127.0.0.1:${port}`;

  return {
    url: newStartUrl(),
    origin,
    port,
    token,
    newStartUrl,
    close: () =>
      new Promise<void>((resolve) => {
        changeStreams.closeAll();
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
