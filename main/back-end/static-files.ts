import fs from 'node:fs/promises';
import path from 'node:path';

export type StaticFile = { readonly body: Buffer; readonly extension: string };

function inside(root: string, candidate: string): boolean {
  return candidate === root || candidate.startsWith(root + path.sep);
}

/**
 * Reads a file of the built renderer by URL path, refusing anything outside its folder: the
 * path as written and, after following symbolic links, the real path (a link inside the folder
 * that points out of it is refused). Paths without an extension fall back to index.html so
 * screens can be deep-linked.
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
  if (!inside(root, candidate)) return null;
  const target = path.extname(candidate) === '' ? path.join(root, 'index.html') : candidate;
  try {
    const [realRoot, realTarget] = await Promise.all([fs.realpath(root), fs.realpath(target)]);
    if (!inside(realRoot, realTarget)) return null;
    const stat = await fs.stat(realTarget);
    if (!stat.isFile()) return null;
    return { body: await fs.readFile(realTarget), extension: path.extname(target) };
  } catch {
    return null;
  }
}
