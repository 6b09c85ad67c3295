import { tokenHeader } from '../../contract/api.js';
import {
  changeEventName,
  changeKinds,
  changeNoticeSchema,
  changeStreamPath,
  type ChangeNotice,
} from '../../contract/change-notices.js';

export type ServerSentEvent = { readonly event: string; readonly data: string };

/**
 * Splits the text of a Server-Sent Events stream read so far into its complete events (a blank
 * line ends each) and the unfinished rest. Only `event` and `data` fields are kept; comments
 * (heartbeats) and `retry` are dropped.
 */
export function parseEventStream(text: string): { events: ServerSentEvent[]; rest: string } {
  const normalised = text.replace(/\r\n?/g, '\n');
  const blocks = normalised.split('\n\n');
  const rest = blocks.pop() ?? '';
  const events: ServerSentEvent[] = [];
  for (const block of blocks) {
    let event = 'message';
    const data: string[] = [];
    for (const line of block.split('\n')) {
      if (line === '' || line.startsWith(':')) continue;
      const colon = line.indexOf(':');
      const field = colon < 0 ? line : line.slice(0, colon);
      const value = colon < 0 ? '' : line.slice(colon + 1).replace(/^ /, '');
      if (field === 'event') event = value;
      else if (field === 'data') data.push(value);
    }
    if (data.length > 0) events.push({ event, data: data.join('\n') });
  }
  return { events, rest };
}

/** A notice from untrusted text; null when it is not one. */
export function readNotice(data: unknown): ChangeNotice | null {
  let value = data;
  if (typeof data === 'string') {
    try {
      value = JSON.parse(data);
    } catch {
      return null;
    }
  }
  const parsed = changeNoticeSchema.safeParse(value);
  return parsed.success ? parsed.data : null;
}

/** One notice of every kind: what a screen is told after a gap in the stream (notices were missed). */
export function everythingChanged(): ChangeNotice[] {
  return changeKinds.map((kind) => ({ kind, elsewhere: false }));
}

/** Settles when the tab is shown (at once when it is). */
function visible(): Promise<void> {
  if (!document.hidden) return Promise.resolve();
  return new Promise((resolve) => {
    const onChange = () => {
      if (document.hidden) return;
      document.removeEventListener('visibilitychange', onChange);
      resolve();
    };
    document.addEventListener('visibilitychange', onChange);
  });
}

function pause(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms));
}

/**
 * The loopback host's change stream for this tab: one `fetch` of `changeStreamPath` with the
 * bridge token (EventSource cannot send the header), opened when the first listener subscribes
 * and kept while the tab is open and shown (closed while it is hidden). A stream opened again
 * (after a drop, with a growing wait, or when the tab is shown again) first tells every listener
 * one notice of every kind, since notices were missed meanwhile. A refused token (403) stops it:
 * the bridge's own calls tell the user what to do.
 */
export function loopbackChangeStream(
  token: string | null,
): (listener: (notice: ChangeNotice) => void) => () => void {
  const listeners = new Set<(notice: ChangeNotice) => void>();
  let started = false;

  function emit(notice: ChangeNotice): void {
    for (const listener of [...listeners]) listener(notice);
  }

  async function run(): Promise<void> {
    let failures = 0;
    let openedBefore = false;
    for (;;) {
      // A hidden tab holds no stream: a browser allows few connections per host, which a
      // stream per tab could use up; on its return the tab's screens refresh once.
      await visible();
      const connection = new AbortController();
      const onHidden = () => {
        if (document.hidden) connection.abort();
      };
      document.addEventListener('visibilitychange', onHidden);
      try {
        const response = await fetch(changeStreamPath, {
          headers: { [tokenHeader]: token ?? '' },
          cache: 'no-store',
          signal: connection.signal,
        });
        if (response.status === 403) return;
        if (!response.ok || response.body === null) throw new Error(`HTTP ${String(response.status)}`);
        if (openedBefore) everythingChanged().forEach(emit);
        openedBefore = true;
        failures = 0;
        const reader = response.body.pipeThrough(new TextDecoderStream()).getReader();
        let buffer = '';
        for (;;) {
          const { value, done } = await reader.read();
          if (done) break;
          const parsed = parseEventStream(buffer + value);
          buffer = parsed.rest;
          for (const event of parsed.events) {
            if (event.event !== changeEventName) continue;
            const notice = readNotice(event.data);
            if (notice !== null) emit(notice);
          }
        }
      } catch {
        // Dropped (the host stopped, the computer slept) or closed as the tab was hidden.
      } finally {
        document.removeEventListener('visibilitychange', onHidden);
      }
      if (connection.signal.aborted) continue;
      failures += 1;
      await pause(Math.min(30_000, 1000 * 2 ** Math.min(failures, 5)));
    }
  }

  return (listener) => {
    listeners.add(listener);
    // Opened with the first listener and kept for the tab's life: screens come and go as the
    // user moves around, and a stream reopened for each would miss the notices in between.
    if (!started) {
      started = true;
      void run();
    }
    return () => {
      listeners.delete(listener);
    };
  };
}
