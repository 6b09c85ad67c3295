import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { defineConfig, type Plugin, type UserConfig } from 'vite';
import react from '@vitejs/plugin-react';

const root = path.dirname(fileURLToPath(import.meta.url));

/** Zod's JSON Schema modules, which the renderer never calls (`npm run schema` runs in Node). */
const jsonSchemaModule = /(^|[\\/])(json-schema-processors|to-json-schema|json-schema-generator)\.js$/;
const withoutPrefix = '\0tidewing-without-json-schema:';

/**
 * Keeps zod's JSON Schema generation out of the renderer. Every zod schema type refers to its
 * JSON Schema converter, so the bundler cannot drop that code by itself; here those modules are
 * replaced by stand-ins with the same export names, each a function that throws if ever called
 * (`schema.toJSONSchema()` in a screen would fail loudly, not quietly). Validation is untouched.
 */
function withoutJsonSchema(): Plugin {
  return {
    name: 'tidewing-without-json-schema',
    enforce: 'pre',
    async resolveId(source, importer) {
      if (importer === undefined || !/[\\/]node_modules[\\/]zod[\\/]/.test(importer)) return null;
      if (!jsonSchemaModule.test(source)) return null;
      const resolved = await this.resolve(source, importer, { skipSelf: true });
      return resolved === null ? null : `${withoutPrefix}${resolved.id}`;
    },
    async load(id) {
      if (!id.startsWith(withoutPrefix)) return null;
      const real = id.slice(withoutPrefix.length);
      const names = Object.keys((await import(pathToFileURL(real).href)) as Record<string, unknown>);
      return [
        "const unavailable = () => { throw new Error('JSON Schema generation is not part of the renderer'); };",
        // Called when a schema is made or read (`toJSONSchema`, `~standard`): hand back the thrower.
        'function standIn() { return unavailable; }',
        ...names.map((name) =>
          name === 'default' ? 'export default standIn;' : `export { standIn as ${name} };`,
        ),
      ].join('\n');
    },
  };
}

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
    plugins: [withoutJsonSchema(), react()],
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
