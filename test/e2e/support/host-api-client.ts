import { tokenHeader, tokenMetaName } from '../../../app/contract/api.js';

export type ApiAnswer<T = unknown> = { ok: boolean; value?: T; error?: { code?: string; message?: string } };
export type ApiClient = <T = unknown>(channel: string, payload: unknown) => Promise<ApiAnswer<T>>;

/**
 * A bridge client outside the browser, for load tests: it spends a one-time start address as a
 * browser would (cookie, then the page that carries the token) and then calls `POST /api/<channel>`
 * with the token header, like the renderer's bridge.
 */
export async function connectApi(startUrl: string): Promise<ApiClient> {
  const origin = new URL(startUrl).origin;
  const opened = await fetch(startUrl, { redirect: 'manual' });
  const cookie = (opened.headers.get('set-cookie') ?? '').split(';')[0] ?? '';
  const location = opened.headers.get('location') ?? '/';
  if (cookie === '') throw new Error(`The start address gave no cookie (status ${String(opened.status)}).`);
  const page = await fetch(new URL(location, origin), { headers: { cookie } });
  const html = await page.text();
  const token = new RegExp(`<meta name="${tokenMetaName}" content="([^"]+)"`).exec(html)?.[1];
  if (token === undefined) throw new Error('The page after the start address carried no bridge token.');
  return async <T>(channel: string, payload: unknown) => {
    const response = await fetch(`${origin}/api/${channel}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', [tokenHeader]: token },
      body: JSON.stringify(payload),
    });
    return (await response.json()) as ApiAnswer<T>;
  };
}
