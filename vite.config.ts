// Builds the renderer (browser code) into dist/renderer, loaded by both the desktop shell and the
// browser mode. Relative asset paths, so it works under app:// and http://127.0.0.1 alike.
import { defineConfig } from 'vite';

export default defineConfig({
  root: 'renderer',
  base: './',
  build: {
    outDir: '../dist/renderer',
    emptyOutDir: true,
    sourcemap: true,
    target: 'es2022',
  },
  worker: { format: 'es' },
});
