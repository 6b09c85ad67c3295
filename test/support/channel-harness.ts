/**
 * A back end on a fresh temporary data folder, reached only through the one dispatcher, for the
 * channel tests in test/main/channels-*.test.ts. Time is a settable clock so answers are exact.
 */
import { expect } from 'vitest';
import type { ChannelName, RequestOf, ResponseOf } from '../../app/contract/channels.js';
import type { ContractError } from '../../app/contract/result.js';
import { startBackEnd, type BackEnd } from '../../main/back-end/back-end.js';
import { temporaryFolder } from './temporary-folder.js';

export type Clock = { now: Date; set(iso: string): void };

export type ChannelHarness = {
  readonly backEnd: BackEnd;
  readonly dataDirectory: string;
  readonly clock: Clock;
  /** Dispatches a request the contract should accept; fails the test with the error otherwise. */
  answer<C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<ResponseOf<C>>;
  /** Dispatches a request that should be refused; fails the test if it was answered. */
  refusal(channel: ChannelName, request: unknown): Promise<ContractError>;
  close(): void;
};

/** The instant every harness starts at (UTC). */
export const harnessStart = '2026-12-01T09:30:00.000Z';

/**
 * Opens a back end (species reference seeded, as at every start) on a new temporary folder.
 * Call `close()` (e.g. from afterEach) to close the database and remove the folder.
 */
export function openChannelHarness(options: { automaticBackup?: boolean } = {}): ChannelHarness {
  const temp = temporaryFolder('tidewing-channels-');
  const clock: Clock = {
    now: new Date(harnessStart),
    set(iso) {
      clock.now = new Date(iso);
    },
  };
  const backEnd = startBackEnd({
    dataDirectory: temp.folder,
    appVersion: '9.8.7',
    host: 'browser',
    now: () => clock.now,
    ...(options.automaticBackup === true ? { automaticBackup: true } : {}),
  });
  return {
    backEnd,
    dataDirectory: temp.folder,
    clock,
    async answer(channel, request) {
      const result = await backEnd.dispatch(channel, request);
      if (!result.ok) expect.fail(`${channel} was refused: ${JSON.stringify(result.error)}`);
      return result.value as never;
    },
    async refusal(channel, request) {
      const result = await backEnd.dispatch(channel, request);
      if (result.ok) expect.fail(`${channel} answered a request it should refuse: ${JSON.stringify(result)}`);
      return result.error;
    },
    close() {
      backEnd.close();
      temp.remove();
    },
  };
}
