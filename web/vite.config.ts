import preact from '@preact/preset-vite';
import { defineConfig } from 'vite';

/** The dashboard: built to web/dist, which the API serves on its own port (services/api/src/static.ts). */
export default defineConfig({
  root: import.meta.dirname,
  base: '/',
  plugins: [preact()],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    target: 'es2022',
    // The API's CSP allows scripts from 'self' only: no inline polyfill.
    modulePreload: { polyfill: false },
    sourcemap: false,
  },
});
