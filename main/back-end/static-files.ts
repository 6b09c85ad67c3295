import fs from 'node:fs/promises';
import path from 'node:path';

export type StaticFile = { readonly body: Buffer; readonly extension: string };

/**
 * Reads a file of the built renderer by URL path, refusing anything outside its folder.
 * Paths without an extension fall back to index.html so screens can be deep-linked.
 */
export async function readRendererFile(
  rendererDirectory: string,
  urlPath: string,
): Promise<StaticFile | null> {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0')) return null;
  const root = path.resolve(rendererDirectory);
  const relative = decoded === '/' || decoded === '' ? 'index.html' : decoded.replace(/^\/+/, '');
  const candidate = path.resolve(root, relative);
  if (candidate !== root && !candidate.startsWith(root + path.sep)) return null;
  const target = path.extname(candidate) === '' ? path.join(root, 'index.html') : candidate;
  try {
    const stat = await fs.stat(target);
    if (!stat.isFile()) return null;
    return { body: await fs.readFile(target), extension: path.extname(target) };
  } catch {
    return null;
  }
}
