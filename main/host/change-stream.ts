import type http from 'node:http';
import { changeEventName, type ChangeNotice } from '../../app/contract/change-notices.js';
import type { ChangeSource } from '../back-end/change-notices.js';
import { securityHeaders } from '../back-end/security-headers.js';

/** A comment line sent this often keeps idle connections (and anything between) from timing out. */
export const heartbeatMs = 15_000;

/** How long a page waits before reconnecting a dropped stream, ms (the SSE `retry` field). */
const reconnectMs = 2_000;

/**
 * The loopback host's change stream: each open page holds one Server-Sent Events response, and
 * every change notice of the back end is written to all of them. Access is checked by the host
 * before `open` (the bridge token header, our own origin), so the page reads the stream with
 * `fetch` (EventSource cannot send the header).
 */
export class ChangeStreams {
  private readonly open_ = new Set<{ response: http.ServerResponse; end: () => void }>();

  constructor(private readonly source: Pick<ChangeSource, 'subscribe'> | undefined) {}

  open(request: http.IncomingMessage, response: http.ServerResponse): void {
    if (request.method !== 'GET') {
      response.writeHead(405, {
        ...securityHeaders,
        'content-type': 'text/plain; charset=utf-8',
        allow: 'GET',
      });
      response.end('Use GET');
      return;
    }
    response.writeHead(200, {
      ...securityHeaders,
      'content-type': 'text/event-stream; charset=utf-8',
      'cache-control': 'no-store',
      connection: 'keep-alive',
      'x-accel-buffering': 'no',
    });
    // The first bytes tell the page the stream is open (and when to reconnect if it drops).
    response.write(`retry: ${String(reconnectMs)}\n: listening for changes\n\n`);
    const unsubscribe =
      this.source?.subscribe((notice: ChangeNotice) => {
        response.write(`event: ${changeEventName}\ndata: ${JSON.stringify(notice)}\n\n`);
      }) ?? (() => undefined);
    const heartbeat = setInterval(() => response.write(': heartbeat\n\n'), heartbeatMs);
    heartbeat.unref();
    const entry = {
      response,
      end: () => {
        clearInterval(heartbeat);
        unsubscribe();
        this.open_.delete(entry);
      },
    };
    this.open_.add(entry);
    // The response's close (not the request's, which comes once the request is read) marks a
    // page gone.
    response.on('close', entry.end);
  }

  /** Ends every open stream (the host is shutting down). */
  closeAll(): void {
    for (const entry of [...this.open_]) {
      entry.end();
      entry.response.end();
    }
  }
}
