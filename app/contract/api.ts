import type { ChangeNotice } from './change-notices.js';
import type { ChannelName, RequestOf, ResponseOf } from './channels.js';
import type { Result } from './result.js';

/** What the renderer sees on `window.tidewing`, whichever host it runs in. */
export type TidewingApi = {
  invoke<C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<Result<ResponseOf<C>>>;
  /**
   * Calls `listener` with each change notice (a write on this workstation or, on a shared
   * database, on another); returns the function that stops it.
   */
  onChange(listener: (notice: ChangeNotice) => void): () => void;
};

/** The token header the loopback host requires on every bridge call. */
export const tokenHeader = 'x-tidewing-token';
/**
 * Name of the `<meta>` element through which the loopback host hands the bridge token to the
 * first page loaded after a start address is used (never in an address, a cookie or a log).
 */
export const tokenMetaName = 'tidewing-bridge-token';
/** Path prefix of the loopback bridge; the channel name follows. */
export const bridgePathPrefix = '/api/';
