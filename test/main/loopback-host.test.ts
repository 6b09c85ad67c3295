import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { startBackEnd } from '../../main/back-end/back-end.js';
import { startLoopbackHost, type LoopbackHost } from '../../main/host/loopback-host.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

async function host(): Promise<LoopbackHost> {
  const temp = temporaryFolder();
  // A stand-in renderer folder, so this test does not depend on a prior build.
  const renderer = path.join(temp.folder, 'renderer');
  fs.mkdirSync(renderer);
  fs.writeFileSync(path.join(renderer, 'index.html'), '<!doctype html><div id="root"></div>');
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

type Reply = { status: number; body: string; headers: http.IncomingHttpHeaders };

function request(
  port: number,
  options: { path: string; method?: string; headers?: Record<string, string>; body?: string },
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

describe('loopback browser host', () => {
  it('listens on 127.0.0.1 only and serves the app with the token, setting an HttpOnly cookie', async () => {
    const started = await host();
    expect(started.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/\?token=[\w-]{20,}$/);
    const page = await request(started.port, { path: `/?token=${started.token}` });
    expect(page.status).toBe(200);
    expect(page.body).toContain('<div id="root">');
    expect(page.headers['content-security-policy']).toContain("script-src 'self'");
    expect(page.headers['set-cookie']?.[0]).toMatch(/HttpOnly; SameSite=Strict/);
  });

  it('refuses requests without the token or with a wrong one (403)', async () => {
    const started = await host();
    expect((await request(started.port, { path: '/' })).status).toBe(403);
    expect((await request(started.port, { path: '/?token=wrong' })).status).toBe(403);
    expect(
      (await request(started.port, { path: '/api/settings:get', method: 'POST', body: '{}' })).status,
    ).toBe(403);
  });

  it('refuses a foreign Host header (DNS rebinding) with 421', async () => {
    const started = await host();
    const reply = await request(started.port, {
      path: `/?token=${started.token}`,
      headers: { host: `evil.example:${started.port}` },
    });
    expect(reply.status).toBe(421);
  });

  it('accepts the cookie for files but requires the token header for bridge calls', async () => {
    const started = await host();
    const cookie = `tidewing_token=${started.token}`;
    expect((await request(started.port, { path: '/', headers: { cookie } })).status).toBe(200);
    expect(
      (
        await request(started.port, {
          path: '/api/settings:get',
          method: 'POST',
          body: '{}',
          headers: { cookie },
        })
      ).status,
    ).toBe(403);
    const answer = await request(started.port, {
      path: '/api/settings:get',
      method: 'POST',
      body: '{}',
      headers: { 'x-tidewing-token': started.token },
    });
    expect(answer.status).toBe(200);
    expect(JSON.parse(answer.body)).toEqual({ ok: true, value: { settings: null, updatedAt: null } });
  });

  it('answers malformed JSON with a clear error and refuses paths outside the renderer', async () => {
    const started = await host();
    const bad = await request(started.port, {
      path: '/api/settings:save',
      method: 'POST',
      body: '{nope',
      headers: { 'x-tidewing-token': started.token },
    });
    expect(bad.status).toBe(400);
    expect(JSON.parse(bad.body)).toMatchObject({ ok: false, error: { code: 'invalid-request' } });
    const traversal = await request(started.port, { path: `/..%2f..%2fpackage.json?token=${started.token}` });
    expect(traversal.status).toBe(404);
  });
});
