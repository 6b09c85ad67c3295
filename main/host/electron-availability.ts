import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

export type ElectronAvailability =
  { readonly ok: true; readonly binary: string } | { readonly ok: false; readonly reason: string };

/**
 * Whether the desktop window can open here. Electron 42+ fetches its runtime on first launch;
 * where that cannot happen (no network to its download host, no display), the caller falls back
 * to the loopback browser host.
 */
export function electronAvailability(
  root: string,
  env: NodeJS.ProcessEnv,
  platform: NodeJS.Platform,
  forceBrowser: boolean,
): ElectronAvailability {
  if (forceBrowser) return { ok: false, reason: '--browser was given' };
  if (platform === 'linux' && !env['DISPLAY'] && !env['WAYLAND_DISPLAY'])
    return { ok: false, reason: 'there is no graphical display (DISPLAY is not set)' };
  const packageFolder = path.join(root, 'node_modules', 'electron');
  if (!fs.existsSync(packageFolder)) return { ok: false, reason: 'the electron package is not installed' };
  const pathFile = path.join(packageFolder, 'path.txt');
  const binaryFromPathFile = () => {
    if (!fs.existsSync(pathFile)) return null;
    const binary = path.join(packageFolder, 'dist', fs.readFileSync(pathFile, 'utf8').trim());
    return fs.existsSync(binary) ? binary : null;
  };
  const present = binaryFromPathFile();
  if (present !== null) return { ok: true, binary: present };
  const install = spawnSync(process.execPath, [path.join(packageFolder, 'install.js')], {
    stdio: 'ignore',
    timeout: 120_000,
    env,
  });
  const fetched = binaryFromPathFile();
  if (install.status === 0 && fetched !== null) return { ok: true, binary: fetched };
  return { ok: false, reason: 'the Electron runtime is not on this machine and could not be downloaded' };
}
