import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

// The renderer bundle: src-renderer/index.html to dist/renderer, loaded by the Electron window
// (from disk, hence relative asset paths) and served by the local web host. Nothing is fetched
// from another origin at run time: fonts, charts and the worker are all in the bundle.
const here = decodeURIComponent(new URL('.', import.meta.url).pathname);

export default defineConfig({
  root: here,
  base: './',
  plugins: [react()],
  build: {
    outDir: `${here}../dist/renderer`,
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: false,
    // ECharts alone is about 1 MB unminified; the app is offline, so one larger chunk is fine.
    chunkSizeWarningLimit: 2000,
  },
  worker: { format: 'es' },
  server: { host: '127.0.0.1', strictPort: true },
});
