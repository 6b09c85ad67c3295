import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import zlib from 'node:zlib';
import { afterEach, describe, expect, it } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { cacheControlFor, chooseEncoding, immutableCacheControl } from '../../main/host/asset-encoding.js';
import { startLoopbackHost, type LoopbackHost } from '../../main/host/loopback-host.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

// Stand-in build output, so this test does not depend on a prior build: a hashed script large
// enough to compress, a small hashed style sheet, an unhashed text file and a page.
const script = `export const lines = [${Array.from({ length: 400 }, (_, index) => `'line ${String(index)}'`).join(', ')}];\n`;
const style = 'body { margin: 0 }\n';
const notes = 'Notes that are not hashed. '.repeat(100);
const page = `<!doctype html><html><head><title>t</title></head><body><div id="root"></div>${'<p>filler</p>'.repeat(150)}</body></html>`;

async function host(): Promise<LoopbackHost> {
  const temp = temporaryFolder();
  const renderer = path.join(temp.folder, 'renderer');
  fs.mkdirSync(path.join(renderer, 'assets'), { recursive: true });
  fs.writeFileSync(path.join(renderer, 'index.html'), page);
  fs.writeFileSync(path.join(renderer, 'assets', 'index-Ab_d-234.js'), script);
  fs.writeFileSync(path.join(renderer, 'assets', 'index-Zz9yX8w7.css'), style);
  fs.writeFileSync(path.join(renderer, 'notes.txt'), notes);
  const backEnd = startBackEnd({
    dataDirectory: path.join(temp.folder, 'data'),
    appVersion: '1.0.0',
    host: 'browser',
  });
  const started = await startLoopbackHost({
    port: 0,
    rendererDirectory: renderer,
    dispatch: backEnd.dispatch,
  });
  cleanups.push(
    temp.remove,
    () => backEnd.close(),
    () => started.close(),
  );
  return started;
}

type Reply = { status: number; body: Buffer; headers: http.IncomingHttpHeaders };

/** A request that keeps the bytes as sent (Node's client never decodes them). */
function request(
  port: number,
  requestPath: string,
  headers: Record<string, string>,
  method = 'GET',
): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const outgoing = http.request(
      { host: '127.0.0.1', port, path: requestPath, method, headers },
      (response) => {
        const chunks: Buffer[] = [];
        response.on('data', (chunk: Buffer) => chunks.push(chunk));
        response.on('end', () =>
          resolve({
            status: response.statusCode ?? 0,
            body: Buffer.concat(chunks),
            headers: response.headers,
          }),
        );
      },
    );
    outgoing.on('error', reject);
    outgoing.end();
  });
}

/** The cookie of a used start address. */
async function cookieOf(started: LoopbackHost): Promise<string> {
  const address = new URL(started.url);
  const reply = await request(started.port, `${address.pathname}${address.search}`, {});
  expect(reply.status).toBe(303);
  return (reply.headers['set-cookie']?.[0] ?? '').split(';')[0] ?? '';
}

describe('loopback host: caching and compression of the renderer files', () => {
  it('lets the browser keep hashed assets for a year and never keeps pages or unhashed files', async () => {
    const started = await host();
    const cookie = await cookieOf(started);
    const asset = await request(started.port, '/assets/index-Ab_d-234.js', { cookie });
    expect(asset.status).toBe(200);
    expect(asset.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    for (const unhashed of ['/', '/index.html', '/notes.txt', '/#/plans']) {
      const reply = await request(started.port, unhashed, { cookie });
      expect(reply.status).toBe(200);
      expect(reply.headers['cache-control']).toBe('no-store');
    }
    expect(cacheControlFor('/assets/index-BYWriAJf.js')).toBe(immutableCacheControl);
    expect(cacheControlFor('/assets/index-BYWriAJf.js.map')).toBe(immutableCacheControl);
    expect(cacheControlFor('/assets/plain.js')).toBe('no-store');
    expect(cacheControlFor('/print.html')).toBe('no-store');
    // Refusals are never kept either.
    const refused = await request(started.port, '/assets/index-Ab_d-234.js', {});
    expect(refused.status).toBe(403);
    expect(refused.headers['cache-control']).toBe('no-store');
  });

  it('sends Brotli or gzip as the browser accepts, with the length of the bytes sent, decoding to the file', async () => {
    const started = await host();
    const cookie = await cookieOf(started);
    const original = Buffer.from(script);
    const cases = [
      { accept: 'gzip, deflate, br, zstd', encoding: 'br', decode: zlib.brotliDecompressSync },
      { accept: 'gzip, br;q=0', encoding: 'gzip', decode: zlib.gunzipSync },
      { accept: 'gzip', encoding: 'gzip', decode: zlib.gunzipSync },
    ] as const;
    for (const { accept, encoding, decode } of cases) {
      // Twice: the second answer comes from memory and must be the same.
      for (let round = 0; round < 2; round += 1) {
        const reply = await request(started.port, '/assets/index-Ab_d-234.js', {
          cookie,
          'accept-encoding': accept,
        });
        expect(reply.headers['content-encoding']).toBe(encoding);
        expect(reply.headers['vary']).toBe('Accept-Encoding');
        expect(Number(reply.headers['content-length'])).toBe(reply.body.length);
        expect(reply.body.length).toBeLessThan(original.length / 2);
        expect(decode(reply.body).equals(original)).toBe(true);
      }
    }
    for (const accept of [undefined, 'identity', '*;q=0']) {
      const reply = await request(started.port, '/assets/index-Ab_d-234.js', {
        cookie,
        ...(accept === undefined ? {} : { 'accept-encoding': accept }),
      });
      expect(reply.headers['content-encoding']).toBeUndefined();
      expect(reply.headers['vary']).toBe('Accept-Encoding');
      expect(Number(reply.headers['content-length'])).toBe(original.length);
      expect(reply.body.equals(original)).toBe(true);
    }
    // An unhashed text file is compressed too, afresh each time.
    const text = await request(started.port, '/notes.txt', { cookie, 'accept-encoding': 'br' });
    expect(text.headers['content-encoding']).toBe('br');
    expect(zlib.brotliDecompressSync(text.body).toString('utf8')).toBe(notes);
  });

  it('answers a HEAD with the headers of the GET and no body', async () => {
    const started = await host();
    const cookie = await cookieOf(started);
    const headers = { cookie, 'accept-encoding': 'br' };
    const get = await request(started.port, '/assets/index-Ab_d-234.js', headers);
    const head = await request(started.port, '/assets/index-Ab_d-234.js', headers, 'HEAD');
    expect(head.status).toBe(200);
    expect(head.body.length).toBe(0);
    expect(head.headers['content-length']).toBe(get.headers['content-length']);
    expect(head.headers['content-encoding']).toBe('br');
    expect(head.headers['cache-control']).toBe(immutableCacheControl);
  });

  it('leaves small files and the page that carries the bridge token uncompressed', async () => {
    const started = await host();
    const cookie = await cookieOf(started);
    const small = await request(started.port, '/assets/index-Zz9yX8w7.css', {
      cookie,
      'accept-encoding': 'br',
    });
    expect(small.headers['content-encoding']).toBeUndefined();
    expect(small.body.toString('utf8')).toBe(style);
    const first = await request(started.port, '/', { cookie, 'accept-encoding': 'br, gzip' });
    expect(first.headers['content-encoding']).toBeUndefined();
    expect(first.body.toString('utf8')).toContain(started.token);
    expect(Number(first.headers['content-length'])).toBe(first.body.length);
    const next = await request(started.port, '/', { cookie, 'accept-encoding': 'br, gzip' });
    expect(next.headers['content-encoding']).toBe('br');
    expect(zlib.brotliDecompressSync(next.body).toString('utf8')).toBe(page);
  });
});

describe('choice of encoding', () => {
  it('prefers Brotli, falls back to gzip and honours q=0 and *', () => {
    expect(chooseEncoding('gzip, deflate, br')).toBe('br');
    expect(chooseEncoding('br;q=0, gzip;q=0.8')).toBe('gzip');
    expect(chooseEncoding('deflate')).toBeNull();
    expect(chooseEncoding('identity')).toBeNull();
    expect(chooseEncoding('*')).toBe('br');
    expect(chooseEncoding('br;q=0, *')).toBe('gzip');
    expect(chooseEncoding('*;q=0')).toBeNull();
    expect(chooseEncoding('')).toBeNull();
    expect(chooseEncoding(undefined)).toBeNull();
  });
});
