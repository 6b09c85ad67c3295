import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { findProjectRoot } from '../../../main/back-end/project-paths.js';

/**
 * Starting a built Tidewing host as a child process, without the test runner: the e2e tests and
 * the workstation load bench share it.
 */
export const root = findProjectRoot();

export type RunningHost = {
  /** The first one-time start address the host printed. */
  url: string;
  /**
   * The next one-time address the host printed (it prints one after each use of the previous
   * one), waiting for it to appear; for a second page on the same host.
   */
  nextUrl: () => Promise<string>;
  origin: string;
  port: number;
  process: ChildProcess;
  output: () => string;
  stop: () => Promise<number | null>;
};

/** Starts `node build/main/host/start.js` as `npm start` does and waits for the URL line. */
export function startHostProcess(
  dataDirectory: string,
  extraArguments: string[] = [],
  timeoutMs = 10_000,
): Promise<RunningHost> {
  const child = spawn(
    process.execPath,
    [
      path.join(root, 'build', 'main', 'host', 'start.js'),
      '--no-open',
      '--port',
      '0',
      '--data',
      dataDirectory,
      ...extraArguments,
    ],
    {
      env: { ...process.env, CI: 'true', DISPLAY: '' },
      stdio: ['ignore', 'pipe', 'pipe'],
    },
  );
  let output = '';
  child.stdout.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`No URL within ${timeoutMs} ms. Output so far:\n${output}`));
    }, timeoutMs);
    const check = () => {
      const match = /Open: (http:\/\/127\.0\.0\.1:(\d+)\/\?start=[\w-]+)/.exec(output);
      if (match?.[1] === undefined || match[2] === undefined) return;
      clearTimeout(timer);
      const url = match[1];
      let handedOut = 1;
      resolve({
        url,
        nextUrl: () => nextStartAddress(child, () => output, handedOut++, timeoutMs),
        origin: new URL(url).origin,
        port: Number(match[2]),
        process: child,
        output: () => output,
        stop: async () => {
          child.kill('SIGTERM');
          return exited;
        },
      });
    };
    child.stdout.on('data', check);
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`The host exited with code ${String(code)} before printing a URL:\n${output}`));
    });
  });
}

/** The start address number `index` (0 the first) in the host's output, once it is printed. */
function nextStartAddress(
  child: ChildProcess,
  output: () => string,
  index: number,
  timeoutMs: number,
): Promise<string> {
  return new Promise((resolve, reject) => {
    const find = () => {
      const all = [...output().matchAll(/(http:\/\/127\.0\.0\.1:\d+\/\?start=[\w-]+)/g)];
      const address = all[index]?.[1];
      if (address === undefined) return false;
      clearTimeout(timer);
      child.stdout?.off('data', find);
      resolve(address);
      return true;
    };
    const timer = setTimeout(() => {
      child.stdout?.off('data', find);
      reject(new Error(`The host printed no start address number ${index + 1}. Output:\n${output()}`));
    }, timeoutMs);
    if (!find()) child.stdout?.on('data', find);
  });
}
