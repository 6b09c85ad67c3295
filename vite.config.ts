import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

const root = path.dirname(fileURLToPath(import.meta.url));

/** The renderer bundle: built to build/renderer and served by the desktop protocol or the loopback host. */
export default defineConfig({
  root: 'app/ui',
  base: './',
  plugins: [react()],
  build: {
    outDir: '../../build/renderer',
    emptyOutDir: true,
    sourcemap: true,
    target: 'es2022',
    rollupOptions: {
      // The app, and the worksheet alone for the command line's headless print.
      input: { index: path.resolve(root, 'app/ui/index.html'), print: path.resolve(root, 'app/ui/print.html') },
    },
  },
});
