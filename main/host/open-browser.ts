import { spawn } from 'node:child_process';

/** Opens our own loopback URL in the system browser; never called with anything else. */
export function openInSystemBrowser(url: string, platform: NodeJS.Platform = process.platform): void {
  if (!/^http:\/\/127\.0\.0\.1:\d+\//.test(url)) throw new Error('Refusing to open a non-loopback address');
  const command = platform === 'darwin' ? 'open' : platform === 'win32' ? 'explorer.exe' : 'xdg-open';
  const child = spawn(command, [url], { stdio: 'ignore', detached: true });
  child.on('error', () => undefined);
  child.unref();
}
