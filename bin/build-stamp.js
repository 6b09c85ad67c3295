// The build stamp: whether build/ is up to date with the sources `npm start` runs.
//
// `npm run build` runs `node bin/build-stamp.js begin` first (npm's prebuild) and
// `node bin/build-stamp.js end` last (postbuild). `begin` removes the stamp, so a build that fails
// or is interrupted never looks finished, and notes the newest source time it is about to build;
// `end` turns that note into build/build-stamp.json. A source saved during the build is newer
// than the note, so the next `npm start` builds again.
//
// Plain JavaScript with no dependencies: it runs before anything is compiled.
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

/** Folders whose files (and the folders themselves, so a deleted file counts) make the build. */
export const sourceFolders = ['app', 'main', 'db'];

/** Single files that change what the build makes. */
export const sourceFiles = [
  'package.json',
  'package-lock.json',
  'tsconfig.base.json',
  'tsconfig.json',
  'tsconfig.node.json',
  'vite.config.ts',
];

/** Files `npm start` cannot run without; a build missing any of them is not a build. */
export const requiredOutputs = [
  'build/main/host/start.js',
  'build/main/electron/electron-main.js',
  'build/renderer/index.html',
  'build/renderer/print.html',
];

export const stampPath = 'build/build-stamp.json';
const pendingPath = 'build/build-stamp.pending.json';

/**
 * The newest modification time among the sources, in epoch milliseconds (0 when none exist).
 * @param {string} root the project folder
 * @returns {{ newestMs: number, newestFile: string | null }}
 */
export function newestSource(root) {
  let newestMs = 0;
  /** @type {string | null} */
  let newestFile = null;
  /** @param {string} file @param {fs.Stats} stat */
  const consider = (file, stat) => {
    if (stat.mtimeMs > newestMs) {
      newestMs = stat.mtimeMs;
      newestFile = path.relative(root, file);
    }
  };
  /** @param {string} folder */
  const walk = (folder) => {
    consider(folder, fs.statSync(folder));
    for (const entry of fs.readdirSync(folder, { withFileTypes: true })) {
      const file = path.join(folder, entry.name);
      if (entry.isDirectory()) walk(file);
      else if (entry.isFile()) consider(file, fs.statSync(file));
    }
  };
  for (const folder of sourceFolders) {
    const full = path.join(root, folder);
    if (fs.existsSync(full)) walk(full);
  }
  for (const file of sourceFiles) {
    const full = path.join(root, file);
    if (fs.existsSync(full)) consider(full, fs.statSync(full));
  }
  return { newestMs, newestFile };
}

/**
 * The stamp of the last finished build, or null when there is none (or it cannot be read).
 * @param {string} root
 * @returns {{ sourcesNewestMs: number } | null}
 */
export function readStamp(root) {
  try {
    const parsed = JSON.parse(fs.readFileSync(path.join(root, stampPath), 'utf8'));
    return typeof parsed?.sourcesNewestMs === 'number' ? { sourcesNewestMs: parsed.sourcesNewestMs } : null;
  } catch {
    return null;
  }
}

/**
 * Whether `npm start` must build first, and why. Pure: the caller reads the file system.
 * @param {{ stamp: { sourcesNewestMs: number } | null, newestMs: number, newestFile: string | null, missingOutputs: readonly string[] }} facts
 *   newestMs: newest source modification time (epoch ms); missingOutputs: required outputs not found
 * @returns {{ build: boolean, reason: string }}
 */
export function buildDecision({ stamp, newestMs, newestFile, missingOutputs }) {
  if (stamp === null) return { build: true, reason: 'there is no finished build yet' };
  if (missingOutputs.length > 0)
    return { build: true, reason: `the build is incomplete (${missingOutputs.join(', ')} missing)` };
  if (newestMs > stamp.sourcesNewestMs)
    return { build: true, reason: `${newestFile ?? 'a source'} changed since the last build` };
  return { build: false, reason: 'the build is up to date' };
}

/**
 * Reads the sources, the stamp and the outputs of `root` and decides.
 * @param {string} root
 */
export function decideBuild(root) {
  const { newestMs, newestFile } = newestSource(root);
  const missingOutputs = requiredOutputs.filter((file) => !fs.existsSync(path.join(root, file)));
  return buildDecision({ stamp: readStamp(root), newestMs, newestFile, missingOutputs });
}

/**
 * Start of a build: the old stamp goes, the newest source time is noted.
 * @param {string} root
 */
export function beginBuild(root) {
  fs.rmSync(path.join(root, stampPath), { force: true });
  fs.mkdirSync(path.join(root, 'build'), { recursive: true });
  const { newestMs } = newestSource(root);
  fs.writeFileSync(path.join(root, pendingPath), `${JSON.stringify({ sourcesNewestMs: newestMs })}\n`);
}

/**
 * End of a finished build: the noted time becomes the stamp.
 * @param {string} root
 */
export function endBuild(root) {
  fs.renameSync(path.join(root, pendingPath), path.join(root, stampPath));
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const root = path.dirname(path.dirname(fileURLToPath(import.meta.url)));
  const step = process.argv[2];
  if (step === 'begin') beginBuild(root);
  else if (step === 'end') endBuild(root);
  else {
    process.stderr.write('Usage: node bin/build-stamp.js begin|end\n');
    process.exitCode = 2;
  }
}
