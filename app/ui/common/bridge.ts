import { bridgePathPrefix, tokenHeader, type TidewingApi } from '../../contract/api.js';
import type { ChannelName, RequestOf, ResponseOf } from '../../contract/channels.js';
import type { Result } from '../../contract/result.js';

declare global {
  // The desktop preload puts the API here; the browser host leaves it undefined.
  var tidewing: TidewingApi | undefined;
}

const tokenKey = 'tidewing.token';

/** Keeps the loopback token for this tab and removes it from the address bar. */
function takeLoopbackToken(): string | null {
  const url = new URL(window.location.href);
  const fromUrl = url.searchParams.get('token');
  if (fromUrl !== null) {
    window.sessionStorage.setItem(tokenKey, fromUrl);
    url.searchParams.delete('token');
    window.history.replaceState(null, '', `${url.pathname}${url.search}${url.hash}`);
    return fromUrl;
  }
  return window.sessionStorage.getItem(tokenKey);
}

function loopbackApi(): TidewingApi {
  const token = takeLoopbackToken();
  return {
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
                'This page has lost its access token. Open the full address Tidewing printed when it started.',
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

/** The one typed way the screens reach the back end. */
export const api: TidewingApi = globalThis.tidewing ?? loopbackApi();
