import { bridgePathPrefix, tokenHeader, tokenMetaName, type TidewingApi } from '../../contract/api.js';
import type { ChannelName, RequestOf, ResponseOf } from '../../contract/channels.js';
import type { Result } from '../../contract/result.js';
import { loopbackChangeStream, readNotice } from './change-stream.js';

declare global {
  // The desktop preload puts the API here; the browser host leaves it undefined.
  var tidewing: TidewingApi | undefined;
}

const tokenKey = 'tidewing.token';

/**
 * Keeps the loopback token for this tab. The host hands it over once, in a `<meta>` element of
 * the first page after its one-time start address; the tab keeps it in sessionStorage (so a
 * reload keeps working) and the element is removed from the page.
 */
function takeLoopbackToken(): string | null {
  const meta = document.querySelector<HTMLMetaElement>(`meta[name="${tokenMetaName}"]`);
  if (meta !== null) {
    const handedOver = meta.content;
    meta.remove();
    if (handedOver !== '') {
      window.sessionStorage.setItem(tokenKey, handedOver);
      return handedOver;
    }
  }
  return window.sessionStorage.getItem(tokenKey);
}

function loopbackApi(): TidewingApi {
  const token = takeLoopbackToken();
  return {
    onChange: loopbackChangeStream(token),
    async invoke<C extends ChannelName>(channel: C, request: RequestOf<C>): Promise<Result<ResponseOf<C>>> {
      try {
        const response = await fetch(`${bridgePathPrefix}${encodeURIComponent(channel)}`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', [tokenHeader]: token ?? '' },
          body: JSON.stringify(request),
        });
        if (response.status === 403) {
          return {
            ok: false,
            error: {
              code: 'invalid-request',
              message:
                'This tab has no access to Tidewing. Open the newest one-time address Tidewing printed in its terminal (each address works once, in one tab).',
            },
          };
        }
        return (await response.json()) as Result<ResponseOf<C>>;
      } catch {
        return {
          ok: false,
          error: {
            code: 'internal',
            message:
              'Tidewing is not answering. Check that it is still running, then try again; nothing has been saved since the last confirmation.',
          },
        };
      }
    },
  };
}

/** The desktop's API, with each change notice from the main process checked before a screen sees it. */
function desktopApi(desktop: TidewingApi): TidewingApi {
  return {
    invoke: (channel, request) => desktop.invoke(channel, request),
    onChange: (listener) =>
      desktop.onChange((notice: unknown) => {
        const checked = readNotice(notice);
        if (checked !== null) listener(checked);
      }),
  };
}

/** The one typed way the screens reach the back end. */
export const api: TidewingApi =
  globalThis.tidewing === undefined ? loopbackApi() : desktopApi(globalThis.tidewing);
