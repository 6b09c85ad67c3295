import fs from 'node:fs/promises';
import path from 'node:path';

export type StaticFile = {
  readonly body: Buffer;
  readonly extension: string;
  /** The served file's name, e.g. `index.html` for a deep link. */
  readonly name: string;
};

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
    return {
      body: await fs.readFile(realTarget),
      extension: path.extname(target),
      name: path.basename(target),
    };
  } catch {
    return null;
  }
}

/**
 * The app's page with the workstation's pinned theme on its root element (`data-theme`), so the
 * first paint already has it (the page's scripts run too late to avoid a flash, and the content
 * security policy allows no inline script). Any other file, and the system theme, pass unchanged;
 * the print page stays black on white.
 */
export function withPageTheme(file: StaticFile, theme: 'system' | 'light' | 'dim'): Buffer {
  if (file.name !== 'index.html' || theme === 'system') return file.body;
  const text = file.body.toString('utf8');
  const root = /<html\b[^>]*>/i.exec(text);
  if (root === null || /\sdata-theme=/i.test(root[0])) return file.body;
  const at = root.index + root[0].length - 1;
  return Buffer.from(`${text.slice(0, at)} data-theme="${theme}"${text.slice(at)}`, 'utf8');
}
