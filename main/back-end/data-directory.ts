import os from 'node:os';
import path from 'node:path';

/**
 * The platform's per-user data folder for Tidewing, used when `--data` is not given:
 * Linux `$XDG_DATA_HOME/tidewing` (default `~/.local/share/tidewing`), macOS
 * `~/Library/Application Support/Tidewing`, Windows `%APPDATA%\Tidewing`.
 */
export function defaultDataDirectory(
  platform: NodeJS.Platform = process.platform,
  env: NodeJS.ProcessEnv = process.env,
  home: string = os.homedir(),
): string {
  if (platform === 'win32')
    return path.win32.join(env['APPDATA'] ?? path.win32.join(home, 'AppData', 'Roaming'), 'Tidewing');
  if (platform === 'darwin') return path.posix.join(home, 'Library', 'Application Support', 'Tidewing');
  const xdg = env['XDG_DATA_HOME'];
  return path.posix.join(
    xdg !== undefined && xdg !== '' ? xdg : path.posix.join(home, '.local', 'share'),
    'tidewing',
  );
}

/** The database file inside a data folder. */
export function databaseFile(dataDirectory: string): string {
  return path.join(dataDirectory, 'tidewing.db');
}
