import os from 'node:os';
import path from 'node:path';

/**
 * The platform's per-user data folder for Syrinx, used when `--data` is not given:
 * Linux `$XDG_DATA_HOME/syrinx` (default `~/.local/share/syrinx`), macOS
 * `~/Library/Application Support/Syrinx`, Windows `%APPDATA%\Syrinx`.
 */
export function defaultDataDirectory(platform: NodeJS.Platform = process.platform, env: NodeJS.ProcessEnv = process.env, home: string = os.homedir()): string {
  if (platform === 'win32') return path.win32.join(env['APPDATA'] ?? path.win32.join(home, 'AppData', 'Roaming'), 'Syrinx');
  if (platform === 'darwin') return path.posix.join(home, 'Library', 'Application Support', 'Syrinx');
  const xdg = env['XDG_DATA_HOME'];
  return path.posix.join(xdg !== undefined && xdg !== '' ? xdg : path.posix.join(home, '.local', 'share'), 'syrinx');
}

/** The database file inside a data folder. */
export function databaseFile(dataDirectory: string): string {
  return path.join(dataDirectory, 'syrinx.db');
}
