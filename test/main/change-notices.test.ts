import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { ChangeNotice } from '../../app/contract/change-notices.js';
import { createChangeSource, publishingChanges } from '../../main/back-end/change-notices.js';
import { createDispatcher, createHandlers, type HandlerTable } from '../../main/back-end/handlers.js';
import { heartbeatMs } from '../../main/host/change-stream.js';
import { startLoopbackHost } from '../../main/host/loopback-host.js';
import { parseEventStream } from '../../app/ui/common/change-stream.js';
import { openChannelHarness, type ChannelHarness } from '../support/channel-harness.js';
import { enteredByRw, pipValues } from '../support/clinic-birds.js';
import { temporaryFolder } from '../support/temporary-folder.js';

const cleanups: (() => Promise<void> | void)[] = [];
afterEach(async () => {
  for (const cleanup of cleanups.splice(0).reverse()) await cleanup();
});

function harness(): { api: ChannelHarness; notices: ChangeNotice[] } {
  const api = openChannelHarness();
  cleanups.push(() => api.close());
  const notices: ChangeNotice[] = [];
  cleanups.push(api.backEnd.changes.subscribe((notice) => notices.push(notice)));
  return { api, notices };
}

const weight = { weighedOn: '2026-11-01', massG: 40, bodyCondition: 'ideal', weighedBy: 'RW' } as const;

describe('change notices from the dispatcher', () => {
  it('publishes a notice with the patient after a patient and a weight are saved, none for reads', async () => {
    const { api, notices } = harness();
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    await api.answer('weights:add', { patientId: pip.id, values: weight, meta: enteredByRw });
    await api.answer('patients:get', { id: pip.id });
    await api.answer('patients:search', { query: '', limit: 10 });
    expect(notices).toEqual([
      { kind: 'patients', patientId: pip.id, elsewhere: false },
      { kind: 'weights', patientId: pip.id, elsewhere: false },
    ]);
  });

  it('publishes nothing for a refused request or a write the database refused', async () => {
    const { api, notices } = harness();
    await api.refusal('weights:add', { patientId: 1, values: { ...weight, massG: -3 }, meta: enteredByRw });
    // No patient 999: the handler fails, nothing was written.
    await api.refusal('weights:add', { patientId: 999, values: weight, meta: enteredByRw });
    expect(notices).toEqual([]);
  });

  it('publishes only after the handler has finished, and not when its answer fails the response schema', async () => {
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    const api = openChannelHarness();
    cleanups.push(() => api.close());
    const handlers: HandlerTable = createHandlers({
      clinic: api.backEnd.clinic,
      appVersion: '1.0.0',
      dataDirectory: temp.folder,
      host: 'browser',
      now: () => new Date('2026-12-01T09:30:00.000Z'),
    });
    const source = createChangeSource();
    const seen: string[] = [];
    source.subscribe((notice) => seen.push(`notice ${notice.kind}`));
    const slow = publishingChanges(
      createDispatcher({
        ...handlers,
        'drugs:add': async (request) => {
          await new Promise((resolve) => setImmediate(resolve));
          seen.push('handler finished');
          return handlers['drugs:add'](request);
        },
        // An answer that breaks its schema: refused as internal, so nothing is announced.
        'species:add': () => ({ broken: true }) as never,
      }),
      source,
    );
    const drug = {
      name: 'Test drug',
      concentrationMgPerMl: 10,
      doseLowMgPerKg: 1,
      doseHighMgPerKg: null,
      route: 'IM',
      doseSource: 'Invented for this test',
      notes: '',
    };
    const added = await slow('drugs:add', { values: drug, meta: enteredByRw });
    expect(added.ok, JSON.stringify(added)).toBe(true);
    const broken = await slow('species:add', {});
    expect(broken.ok).toBe(false);
    expect(seen).toEqual(['handler finished', 'notice drugs']);
  });

  it('keeps publishing to the other listeners when one throws', () => {
    const logged: string[] = [];
    const source = createChangeSource((message) => logged.push(message));
    const received: ChangeNotice[] = [];
    source.subscribe(() => {
      throw new Error('screen gone');
    });
    source.subscribe((notice) => received.push(notice));
    source.publish({ kind: 'settings' });
    expect(received).toEqual([{ kind: 'settings', elsewhere: false }]);
    expect(logged.join('\n')).toContain('screen gone');
  });
});

/** Opens the change stream; resolves with the response once its headers arrived. */
function openStream(
  port: number,
  headers: Record<string, string>,
): Promise<{ status: number; headers: http.IncomingHttpHeaders; response: http.IncomingMessage }> {
  return new Promise((resolve, reject) => {
    const outgoing = http.request({ host: '127.0.0.1', port, path: '/changes', headers }, (response) =>
      resolve({ status: response.statusCode ?? 0, headers: response.headers, response }),
    );
    outgoing.on('error', reject);
    outgoing.end();
  });
}

/** Reads the stream until `count` change events have arrived. */
function readEvents(
  response: http.IncomingMessage,
  count: number,
): Promise<{ event: string; data: string }[]> {
  return new Promise((resolve, reject) => {
    let text = '';
    const events: { event: string; data: string }[] = [];
    response.setEncoding('utf8');
    response.on('data', (chunk: string) => {
      const parsed = parseEventStream(text + chunk);
      text = parsed.rest;
      events.push(...parsed.events);
      if (events.length >= count) resolve(events);
    });
    response.on('error', reject);
    response.on('end', () => resolve(events));
  });
}

describe('the loopback host change stream', () => {
  async function host() {
    const temp = temporaryFolder();
    const renderer = path.join(temp.folder, 'renderer');
    fs.mkdirSync(renderer);
    fs.writeFileSync(
      path.join(renderer, 'index.html'),
      '<!doctype html><html><head></head><body></body></html>',
    );
    const api = openChannelHarness();
    const started = await startLoopbackHost({
      port: 0,
      rendererDirectory: renderer,
      dispatch: api.backEnd.dispatch,
      changes: api.backEnd.changes,
      token: 'test-token-for-the-change-stream',
    });
    cleanups.push(
      temp.remove,
      () => api.close(),
      () => started.close(),
    );
    return { started, api };
  }

  it('refuses the stream without the token, with a wrong one, or from another origin', async () => {
    const { started } = await host();
    const hostHeader = { host: `127.0.0.1:${String(started.port)}` };
    for (const headers of [
      hostHeader,
      { ...hostHeader, 'x-tidewing-token': 'wrong' },
      { ...hostHeader, 'x-tidewing-token': started.token, origin: 'http://127.0.0.1:1' },
    ]) {
      const reply = await openStream(started.port, headers);
      reply.response.resume();
      expect(reply.status).toBe(403);
    }
    const foreignHost = await openStream(started.port, {
      host: 'example.test',
      'x-tidewing-token': started.token,
    });
    foreignHost.response.resume();
    expect(foreignHost.status).toBe(421);
  });

  it('streams the notice of each write the back end makes, uncached, and ends when the host closes', async () => {
    const { started, api } = await host();
    const stream = await openStream(started.port, { 'x-tidewing-token': started.token });
    expect(stream.status).toBe(200);
    expect(stream.headers['content-type']).toBe('text/event-stream; charset=utf-8');
    expect(stream.headers['cache-control']).toBe('no-store');
    const events = readEvents(stream.response, 2);
    const pip = await api.answer('patients:create', { values: pipValues, meta: enteredByRw });
    await api.answer('weights:add', { patientId: pip.id, values: weight, meta: enteredByRw });
    const received = await events;
    expect(received.map((event) => event.event)).toEqual(['change', 'change']);
    expect(received.map((event) => JSON.parse(event.data) as unknown)).toEqual([
      { kind: 'patients', patientId: pip.id, elsewhere: false },
      { kind: 'weights', patientId: pip.id, elsewhere: false },
    ]);
    const ended = new Promise<void>((resolve) => stream.response.on('close', () => resolve()));
    await started.close();
    await ended;
    expect(stream.response.complete).toBe(true);
  });
});

describe('the change stream heartbeat', () => {
  it('writes a comment line every heartbeat period while the stream is idle', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    cleanups.push(() => void vi.useRealTimers());
    const source = createChangeSource();
    const temp = temporaryFolder();
    cleanups.push(temp.remove);
    const started = await startLoopbackHost({
      port: 0,
      rendererDirectory: temp.folder,
      dispatch: () => Promise.resolve({ ok: true, value: null }),
      changes: source,
      token: 'test-token-for-the-heartbeat',
    });
    cleanups.push(() => started.close());
    const stream = await openStream(started.port, { 'x-tidewing-token': started.token });
    let text = '';
    const waiting: (() => void)[] = [];
    stream.response.setEncoding('utf8');
    stream.response.on('data', (chunk: string) => {
      text += chunk;
      waiting.splice(0).forEach((wake) => wake());
    });
    const heard = async (what: string) => {
      while (!text.includes(what)) await new Promise<void>((resolve) => waiting.push(resolve));
    };
    await heard(': listening for changes');
    expect(text).not.toContain('heartbeat');
    vi.advanceTimersByTime(heartbeatMs);
    await heard(': heartbeat');
    expect(text.match(/: heartbeat/g)?.length).toBe(1);
  });
});

describe('reading a Server-Sent Events stream', () => {
  it('keeps events whole across chunks and drops comments and the retry field', () => {
    const first = parseEventStream('retry: 2000\n: listening\n\nevent: change\ndata: {"kind":');
    expect(first.events).toEqual([]);
    const second = parseEventStream(
      `${first.rest}"plans"}\n\n: heartbeat\n\nevent: change\r\ndata: 2\r\n\r\n`,
    );
    expect(second.events).toEqual([
      { event: 'change', data: '{"kind":"plans"}' },
      { event: 'change', data: '2' },
    ]);
    expect(second.rest).toBe('');
  });
});
