import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

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
  },
});
