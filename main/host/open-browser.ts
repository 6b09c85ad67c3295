import { spawn } from 'node:child_process';

/**
 * Opens our own one-time loopback start address (`http://127.0.0.1:PORT/?start=CODE`) in the
 * system browser. The browser's command line is visible to every user of the computer, so only
 * such an address, useless once opened, is ever passed; anything else is refused.
 */
export function openInSystemBrowser(url: string, platform: NodeJS.Platform = process.platform): void {
  if (!/^http:\/\/127\.0\.0\.1:\d+\/\?start=[\w-]+$/.test(url))
    throw new Error('Refusing to open anything but a one-time loopback start address');
  const command = platform === 'darwin' ? 'open' : platform === 'win32' ? 'explorer.exe' : 'xdg-open';
  const child = spawn(command, [url], { stdio: 'ignore', detached: true });
  child.on('error', () => undefined);
  child.unref();
}
