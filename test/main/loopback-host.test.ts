import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { startLoopbackHost, type LoopbackHost } from '../../main/host/loopback-host.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

async function host(): Promise<LoopbackHost & { renderer: string; outside: string; backEnd: BackEnd }> {
  const temp = temporaryFolder();
  // A stand-in renderer folder, so this test does not depend on a prior build.
  const renderer = path.join(temp.folder, 'renderer');
  fs.mkdirSync(renderer);
  fs.writeFileSync(
    path.join(renderer, 'index.html'),
    '<!doctype html><html><head><title>t</title></head><body><div id="root"></div></body></html>',
  );
  fs.writeFileSync(path.join(renderer, 'app.js'), 'export {};');
  // A file beside the renderer folder that no address may reach.
  const outside = path.join(temp.folder, 'secret.txt');
  fs.writeFileSync(outside, 'not for the browser');
  const backEnd = startBackEnd({
    dataDirectory: path.join(temp.folder, 'data'),
    appVersion: '1.0.0',
    host: 'browser',
  });
  const started = await startLoopbackHost({
    port: 0,
    rendererDirectory: renderer,
    dispatch: backEnd.dispatch,
    pageTheme: backEnd.workstationTheme,
  });
  cleanups.push(
    temp.remove,
    () => backEnd.close(),
    () => started.close(),
  );
  return Object.assign(started, { renderer, outside, backEnd });
}

type Reply = { status: number; body: string; headers: http.IncomingHttpHeaders };

function request(
  port: number,
  options: { path: string; method?: string; headers?: Record<string, string>; body?: string | Buffer },
): Promise<Reply> {
  return new Promise((resolve, reject) => {
    const outgoing = http.request(
      {
        host: '127.0.0.1',
        port,
        path: options.path,
        method: options.method ?? 'GET',
        headers: options.headers,
      },
      (response) => {
        const chunks: Buffer[] = [];
        response.on('data', (chunk: Buffer) => chunks.push(chunk));
        response.on('end', () =>
          resolve({
            status: response.statusCode ?? 0,
            body: Buffer.concat(chunks).toString('utf8'),
            headers: response.headers,
          }),
        );
      },
    );
    outgoing.on('error', reject);
    outgoing.end(options.body);
  });
}

/** Uses a start address; gives the cookie header it set and where it redirected. */
async function open(started: LoopbackHost, url = started.url): Promise<{ cookie: string; location: string }> {
  const address = new URL(url);
  const reply = await request(started.port, { path: `${address.pathname}${address.search}` });
  expect(reply.status).toBe(303);
  const setCookie = reply.headers['set-cookie']?.[0] ?? '';
  return { cookie: setCookie.split(';')[0] ?? '', location: reply.headers.location ?? '' };
}

const tokenMeta = /<meta name="tidewing-bridge-token" content="([\w-]+)" \/>/;

function bridge(
  started: LoopbackHost,
  headers: Record<string, string>,
  body: string | Buffer = '{}',
  path = '/api/settings:get',
): Promise<Reply> {
  return request(started.port, { path, method: 'POST', body, headers });
}

describe('loopback browser host', () => {
  it('prints a one-time start address; its use sets a per-port cookie that is not the bridge token and redirects to the clean address', async () => {
    const started = await host();
    expect(started.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?start=[\w-]{20,}$/);
    expect(started.url).not.toContain(started.token);
    const address = new URL(started.url);
    const reply = await request(started.port, { path: `${address.pathname}${address.search}` });
    expect(reply.status).toBe(303);
    expect(reply.headers.location).toBe('/');
    const setCookie = reply.headers['set-cookie']?.[0] ?? '';
    expect(setCookie).toMatch(/HttpOnly; SameSite=Strict; Path=\//);
    const [name, value] = (setCookie.split(';')[0] ?? '').split('=');
    expect(name).toBe(`tidewing_files_${started.port}`);
    expect(value).toMatch(/^[\w-]{20,}$/);
    expect(value).not.toBe(started.token);
    expect(setCookie).not.toContain(started.token);
  });

  it('hands the bridge token to the first page after the start address only, inside its HTML', async () => {
    const started = await host();
    const { cookie } = await open(started);
    const first = await request(started.port, { path: '/', headers: { cookie } });
    expect(first.status).toBe(200);
    expect(first.body).toContain('<div id="root">');
    expect(first.headers['content-security-policy']).toContain("script-src 'self'");
    expect(tokenMeta.exec(first.body)?.[1]).toBe(started.token);
    const again = await request(started.port, { path: '/', headers: { cookie } });
    expect(again.status).toBe(200);
    expect(again.body).not.toMatch(tokenMeta);
    expect((await request(started.port, { path: '/app.js', headers: { cookie } })).status).toBe(200);
  });

  it('writes the theme this workstation pinned into the page root, and nothing for the system theme', async () => {
    const started = await host();
    fs.writeFileSync(
      path.join(started.renderer, 'print.html'),
      '<!doctype html><html lang="en"><body></body></html>',
    );
    const { cookie } = await open(started);
    const page = async (file = '/') =>
      (await request(started.port, { path: file, headers: { cookie } })).body;
    expect(await page()).toContain('<html>');
    await started.backEnd.dispatch('workstation:save', { theme: 'dim' });
    expect(await page()).toContain('<html data-theme="dim">');
    // A deep link serves the same page; the print page stays black on white.
    expect(await page('/records/3')).toContain('<html data-theme="dim">');
    expect(await page('/print.html')).toContain('<html lang="en">');
    await started.backEnd.dispatch('workstation:save', { theme: 'light' });
    expect(await page()).toContain('<html data-theme="light">');
    await started.backEnd.dispatch('workstation:save', { theme: 'system' });
    expect(await page()).toContain('<html>');
  });

  it('does not hand the token over when the page comes long after the start address was used', async () => {
    const started = await host();
    const { cookie } = await open(started);
    // A page that never loaded leaves a session whose cookie must not fetch the token later.
    vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + 3 * 60 * 1000 });
    try {
      const late = await request(started.port, { path: '/', headers: { cookie } });
      expect(late.status).toBe(200);
      expect(late.body).not.toMatch(tokenMeta);
    } finally {
      vi.useRealTimers();
    }
  });

  it('refuses a start address used once already, and accepts a newly issued one', async () => {
    const started = await host();
    const address0 = new URL(started.url);
    // A HEAD request (a link preview) does not spend the code.
    const head = await request(started.port, {
      path: `${address0.pathname}${address0.search}`,
      method: 'HEAD',
    });
    expect(head.status).toBe(405);
    await open(started);
    const address = new URL(started.url);
    const reuse = await request(started.port, { path: `${address.pathname}${address.search}` });
    expect(reuse.status).toBe(403);
    expect(reuse.body).toMatch(/already been used/);
    expect(reuse.headers['set-cookie']).toBeUndefined();
    const next = started.newStartUrl();
    expect(next).not.toBe(started.url);
    const { cookie } = await open(started, next);
    expect((await request(started.port, { path: '/', headers: { cookie } })).status).toBe(200);
    expect((await request(started.port, { path: '/?start=made-up-code-000000000000' })).status).toBe(403);
  });

  it('keeps the query and path of the start address (minus the code) in the redirect', async () => {
    const started = await host();
    const address = new URL(started.url);
    const reply = await request(started.port, {
      path: `/print.html?paper=a4&start=${address.searchParams.get('start') ?? ''}`,
    });
    expect(reply.status).toBe(303);
    expect(reply.headers.location).toBe('/print.html?paper=a4');
  });

  it('keeps two hosts in one browser apart: each reads its own cookie among both', async () => {
    const first = await host();
    const second = await host();
    const a = await open(first);
    const b = await open(second);
    expect(a.cookie.split('=')[0]).not.toBe(b.cookie.split('=')[0]);
    // The browser sends every 127.0.0.1 cookie to both ports, in either order.
    for (const cookie of [`${a.cookie}; ${b.cookie}`, `${b.cookie}; ${a.cookie}`]) {
      expect((await request(first.port, { path: '/', headers: { cookie } })).status).toBe(200);
      expect((await request(second.port, { path: '/', headers: { cookie } })).status).toBe(200);
    }
    // One host's cookie opens nothing on the other, even under the other's name.
    const foreign = `tidewing_files_${first.port}=${b.cookie.split('=')[1] ?? ''}`;
    expect((await request(first.port, { path: '/', headers: { cookie: foreign } })).status).toBe(403);
  });

  it('refuses files without the cookie, with a wrong one, or with the token in its place (403)', async () => {
    const started = await host();
    expect((await request(started.port, { path: '/' })).status).toBe(403);
    expect((await request(started.port, { path: '/?token=wrong' })).status).toBe(403);
    expect((await request(started.port, { path: `/?token=${started.token}` })).status).toBe(403);
    for (const cookie of [
      `tidewing_files_${started.port}=wrong`,
      `tidewing_files_${started.port}=${started.token}`,
      `tidewing_token=${started.token}`,
    ])
      expect((await request(started.port, { path: '/', headers: { cookie } })).status).toBe(403);
    expect(
      (await request(started.port, { path: '/', headers: { 'x-tidewing-token': started.token } })).status,
    ).toBe(403);
    expect((await bridge(started, {})).status).toBe(403);
  });

  it('refuses a foreign Host header (DNS rebinding) with 421', async () => {
    const started = await host();
    const address = new URL(started.url);
    const reply = await request(started.port, {
      path: `${address.pathname}${address.search}`,
      headers: { host: `evil.example:${started.port}` },
    });
    expect(reply.status).toBe(421);
  });

  it('requires the token header for bridge calls; the file cookie alone is refused', async () => {
    const started = await host();
    const { cookie } = await open(started);
    expect((await bridge(started, { cookie })).status).toBe(403);
    const answer = await bridge(started, { 'x-tidewing-token': started.token });
    expect(answer.status).toBe(200);
    expect(JSON.parse(answer.body)).toEqual({ ok: true, value: { settings: null, updatedAt: null } });
  });

  it('refuses a bridge call with the right token from another origin, and accepts its own origins', async () => {
    const started = await host();
    const token = { 'x-tidewing-token': started.token };
    for (const origin of [
      'http://evil.example',
      `http://127.0.0.1:${started.port + 1 > 65535 ? 1 : started.port + 1}`,
      `https://127.0.0.1:${started.port}`,
      'null',
    ]) {
      const refused = await bridge(started, { ...token, origin });
      expect(refused.status, origin).toBe(403);
      expect(JSON.parse(refused.body)).toMatchObject({ ok: false, error: { code: 'invalid-request' } });
    }
    const crossSite = await bridge(started, { ...token, 'sec-fetch-site': 'same-site' });
    expect(crossSite.status).toBe(403);
    for (const origin of [`http://127.0.0.1:${started.port}`, `http://localhost:${started.port}`]) {
      const answer = await bridge(started, { ...token, origin, 'sec-fetch-site': 'same-origin' });
      expect(answer.status, origin).toBe(200);
    }
  });

  it('answers 400 to malformed percent-encoding in the path, on the bridge and for files', async () => {
    const started = await host();
    const { cookie } = await open(started);
    const malformed = await bridge(started, { 'x-tidewing-token': started.token }, '{}', '/api/%E0%A4%A');
    expect(malformed.status).toBe(400);
    expect((await request(started.port, { path: '/%E0%A4%A', headers: { cookie } })).status).toBe(400);
    expect((await request(started.port, { path: '/assets/%zz.js', headers: { cookie } })).status).toBe(400);
  });

  it('answers 413 to a 3 MB body, declared or streamed, and keeps serving afterwards', async () => {
    const started = await host();
    const big = Buffer.alloc(3 * 1024 * 1024, 0x20);
    const declared = await bridge(started, { 'x-tidewing-token': started.token }, big, '/api/settings:save');
    expect(declared.status).toBe(413);
    expect(JSON.parse(declared.body)).toMatchObject({ ok: false, error: { code: 'invalid-request' } });
    // Without the token too: the size is refused before anything in the body could matter.
    expect((await bridge(started, {}, big, '/api/settings:save')).status).toBe(413);
    const streamed = await new Promise<number>((resolve, reject) => {
      const outgoing = http.request(
        {
          host: '127.0.0.1',
          port: started.port,
          path: '/api/settings:save',
          method: 'POST',
          headers: { 'x-tidewing-token': started.token, 'transfer-encoding': 'chunked' },
        },
        (response) => {
          response.resume();
          resolve(response.statusCode ?? 0);
        },
      );
      outgoing.on('error', reject);
      for (let offset = 0; offset < big.length; offset += 256 * 1024)
        outgoing.write(big.subarray(offset, offset + 256 * 1024));
      outgoing.end();
    });
    expect(streamed).toBe(413);
    expect((await bridge(started, { 'x-tidewing-token': started.token })).status).toBe(200);
  });

  it('answers malformed JSON with a clear error and refuses paths outside the renderer', async () => {
    const started = await host();
    const { cookie } = await open(started);
    const bad = await bridge(started, { 'x-tidewing-token': started.token }, '{nope', '/api/settings:save');
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.body)).toMatchObject({ ok: false, error: { code: 'invalid-request' } });
    const traversal = await request(started.port, { path: '/..%2f..%2fpackage.json', headers: { cookie } });
    expect(traversal.status).toBe(404);
  });

  it('refuses a symbolic link inside the renderer folder that points out of it', async () => {
    const started = await host();
    const { cookie } = await open(started);
    fs.symlinkSync(started.outside, path.join(started.renderer, 'leak.txt'));
    fs.symlinkSync(path.dirname(started.outside), path.join(started.renderer, 'parent'));
    fs.symlinkSync(path.join(started.renderer, 'app.js'), path.join(started.renderer, 'alias.js'));
    for (const address of ['/leak.txt', '/parent/secret.txt']) {
      const reply = await request(started.port, { path: address, headers: { cookie } });
      expect(reply.status, address).toBe(404);
      expect(reply.body).not.toContain('not for the browser');
    }
    // A link that stays inside the folder is still served.
    expect((await request(started.port, { path: '/alias.js', headers: { cookie } })).status).toBe(200);
  });
});
