import { promisify } from 'node:util';
import zlib from 'node:zlib';

/**
 * How the loopback host hands over the renderer's files: hashed build assets (the name carries a
 * hash of the content, so a name always means the same bytes) may be kept by the browser for a
 * year without asking again; pages and anything else unhashed are never kept (`no-store`), so a
 * new build shows at once. Text is compressed (Brotli or gzip) when the browser accepts it;
 * compressed hashed assets are kept in memory, as their bytes never change under their name.
 */

/** Vite's hashed output: `assets/<name>-<8 characters of hash>.<extension>` (and its `.map`). */
const hashedAsset = /^\/assets\/[^/]*-[A-Za-z0-9_-]{8}\.[A-Za-z0-9]+(\.map)?$/;

export const immutableCacheControl = 'public, max-age=31536000, immutable';

/** Cache-Control for a renderer file by its URL path. */
export function cacheControlFor(urlPath: string): string {
  return hashedAsset.test(urlPath) ? immutableCacheControl : 'no-store';
}

export type Encoding = 'br' | 'gzip';

/**
 * The encoding to answer with: Brotli when the browser accepts it, else gzip, else none.
 * `q=0` refuses a coding; `*` stands for any coding not named.
 * @param acceptEncoding the request's Accept-Encoding header
 */
export function chooseEncoding(acceptEncoding: string | undefined): Encoding | null {
  if (acceptEncoding === undefined) return null;
  const weights = new Map<string, number>();
  for (const part of acceptEncoding.split(',')) {
    const [name = '', ...parameters] = part.trim().toLowerCase().split(';');
    if (name === '') continue;
    const q = parameters.map((parameter) => /^\s*q=([0-9.]+)\s*$/.exec(parameter)?.[1]).find(Boolean);
    weights.set(name, q === undefined ? 1 : Number(q));
  }
  const accepts = (coding: Encoding) => (weights.get(coding) ?? weights.get('*') ?? 0) > 0;
  if (accepts('br')) return 'br';
  if (accepts('gzip')) return 'gzip';
  return null;
}

/** Types worth compressing (images and fonts already are). */
export function compressible(contentType: string): boolean {
  return /^(text\/|application\/json|image\/svg\+xml)/.test(contentType);
}

/** Smaller files gain nothing worth a round of compression. */
export const smallestCompressedBytes = 1024;

const brotli = promisify(zlib.brotliCompress);
const gzip = promisify(zlib.gzip);

/**
 * Compresses a body. Brotli at quality 5: about a tenth of the time of its highest quality for
 * about 9 % more bytes, so the first request for a large chunk is not held up.
 */
export function encode(body: Buffer, encoding: Encoding): Promise<Buffer> {
  return encoding === 'br'
    ? brotli(body, {
        params: {
          [zlib.constants.BROTLI_PARAM_QUALITY]: 5,
          [zlib.constants.BROTLI_PARAM_SIZE_HINT]: body.length,
        },
      })
    : gzip(body, { level: 6 });
}

/** Compressed hashed assets, kept for the life of the host (a few hundred KiB in all). */
export class EncodedAssets {
  private readonly kept = new Map<string, Promise<Buffer>>();

  /**
   * The body in `encoding`: from memory for a hashed asset seen before, compressed now otherwise
   * (and kept when hashed).
   */
  get(urlPath: string, body: Buffer, encoding: Encoding): Promise<Buffer> {
    if (cacheControlFor(urlPath) !== immutableCacheControl) return encode(body, encoding);
    const key = `${encoding} ${urlPath}`;
    let found = this.kept.get(key);
    if (found === undefined) {
      found = encode(body, encoding);
      this.kept.set(key, found);
      // A failure is not kept: the next request tries again.
      found.catch(() => this.kept.delete(key));
    }
    return found;
  }
}
