import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, type UserConfig } from 'vite';
import react from '@vitejs/plugin-react';

const root = path.dirname(fileURLToPath(import.meta.url));

/**
 * The renderer: built to build/renderer and served by the desktop protocol or the loopback host,
 * in two passes. The default pass builds the app (index.html). `--mode print` then adds
 * print.html, the worksheet alone that `tidewing worksheet` prints in a cold headless Chromium; it
 * renders the same components through Preact's React-compatible layer (about 10 KiB instead of
 * about 190 KiB), which draws the page about 0.2 s sooner in a browser that has just started.
 */
export default defineConfig(({ mode }): UserConfig => {
  const print = mode === 'print';
  const input: Record<string, string> = print
    ? { print: path.resolve(root, 'app/ui/print.html') }
    : { index: path.resolve(root, 'app/ui/index.html') };
  return {
    root: 'app/ui',
    base: './',
    plugins: [react()],
    resolve: print
      ? {
          alias: [
            { find: /^react-dom\/client$/, replacement: 'preact/compat/client' },
            { find: /^react-dom$/, replacement: 'preact/compat' },
            { find: /^react\/jsx-runtime$/, replacement: 'preact/jsx-runtime' },
            { find: /^react$/, replacement: 'preact/compat' },
          ],
        }
      : {},
    build: {
      outDir: '../../build/renderer',
      // The print pass adds to the app's pass.
      emptyOutDir: !print,
      sourcemap: true,
      target: 'es2022',
      rolldownOptions: {
        input,
        // The timings note names Vite's own plugins when a shared machine is busy; nothing for
        // whoever builds to act on.
        checks: { bundlerTimings: false },
        // The app's pass: the libraries in chunks of their own (each well under the 500 kB
        // warning), so a change to the app's code leaves them unchanged. The print pass stays one
        // small file: a cold headless Chromium loads it at once.
        output: print
          ? {}
          : {
              codeSplitting: {
                groups: [
                  {
                    name: 'react',
                    test: /[\\/]node_modules[\\/](react|react-dom|scheduler)[\\/]/,
                    priority: 20,
                  },
                  { name: 'zod', test: /[\\/]node_modules[\\/]zod[\\/]/, priority: 20 },
                  { name: 'vendor', test: /[\\/]node_modules[\\/]/, priority: 10 },
                ],
              },
            },
      },
    },
  };
});
