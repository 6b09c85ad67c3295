import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The folder holding Tidewing's package.json. Works from the TypeScript sources (tests), from the
 * compiled build/ tree and from inside a packaged app, whose depths differ.
 */
export function findProjectRoot(start: string = path.dirname(fileURLToPath(import.meta.url))): string {
  let folder = start;
  for (;;) {
    const candidate = path.join(folder, 'package.json');
    if (fs.existsSync(candidate)) {
      const parsed = JSON.parse(fs.readFileSync(candidate, 'utf8')) as { name?: string };
      if (parsed.name === 'tidewing') return folder;
    }
    const parent = path.dirname(folder);
    if (parent === folder) throw new Error(`Could not find Tidewing's package.json above ${start}`);
    folder = parent;
  }
}

/** The app version from package.json. */
export function readAppVersion(root: string = findProjectRoot()): string {
  const parsed = JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string };
  return parsed.version;
}

/** Where the built renderer (vite build) lives. */
export function rendererDirectory(root: string = findProjectRoot()): string {
  return path.join(root, 'build', 'renderer');
}
