import {
  changeNoticesFor,
  changeNoticeSchema,
  type ChangeNotice,
  type ChangeNoticeInput,
} from '../../app/contract/change-notices.js';
import { isChannelName } from '../../app/contract/channels.js';
import type { Dispatcher } from './handlers.js';

export type ChangeListener = (notice: ChangeNotice) => void;

/**
 * Where a back end's change notices meet: its own successful writes (`publishingChanges`) and,
 * on PostgreSQL, other workstations' writes (db/change-listener.ts) are published here; the hosts
 * subscribe and pass them to the screens (the loopback host's change stream, the desktop's IPC).
 */
export type ChangeSource = {
  publish(notice: ChangeNoticeInput): void;
  /** Returns the function that ends the subscription. */
  subscribe(listener: ChangeListener): () => void;
};

export function createChangeSource(log: (message: string) => void = () => undefined): ChangeSource {
  const listeners = new Set<ChangeListener>();
  return {
    publish(input) {
      const parsed = changeNoticeSchema.safeParse(input);
      if (!parsed.success) {
        log(`A change notice was dropped: ${parsed.error.message}`);
        return;
      }
      for (const listener of [...listeners]) {
        try {
          listener(parsed.data);
        } catch (error) {
          // One screen's failure must not keep the notice from the others.
          log(`A change listener failed: ${error instanceof Error ? error.message : String(error)}`);
        }
      }
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
  };
}

/**
 * The dispatcher with change notices: after a write channel's call succeeds (its answer passed
 * the response schema), the notices of `changeNoticesOf` for that answer are published. A
 * refused or failed call publishes nothing.
 */
export function publishingChanges(dispatch: Dispatcher, source: ChangeSource): Dispatcher {
  return async (channel, payload) => {
    const result = await dispatch(channel, payload);
    if (result.ok && isChannelName(channel)) {
      for (const notice of changeNoticesFor(channel, result.value as never)) source.publish(notice);
    }
    return result;
  };
}
