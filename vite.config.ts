/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';
import tailwindcss from '@tailwindcss/vite';
import { pageChunkOf } from './scripts/lib/page-chunks.ts';

const apiPort = Number(process.env.EYRIE_API_PORT ?? 3001);

export default defineConfig({
  root: 'web',
  publicDir: false,
  plugins: [react(), tailwindcss()],
  // The shared table reader (api/features/imports/table-text.ts) imports csv-parse/sync; in the
  // browser that is csv-parse's self-contained browser build.
  resolve: { alias: [{ find: /^csv-parse\/sync$/, replacement: 'csv-parse/browser/esm/sync' }] },
  build: {
    outDir: '../dist/web',
    emptyOutDir: true,
    chunkSizeWarningLimit: 1500,
    rolldownOptions: {
      output: {
        // The pages' code in a few chunks rather than one per set of sharing pages (scripts/lib/page-chunks.ts).
        // A captured module's own imports are placed by the same rule, never pulled in after it.
        codeSplitting: {
          includeDependenciesRecursively: false,
          groups: [{ name: (id, ctx) => pageChunkOf(id, ctx) }],
        },
      },
    },
  },
  server: {
    host: '127.0.0.1',
    port: Number(process.env.PORT ?? 3000),
    strictPort: true,
    proxy: {
      '/api': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false },
      '/auth': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false },
      '/dev': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false },
    },
  },
  test: {
    root: '.',
    include: ['tests/**/*.test.{ts,tsx}'],
    environment: 'node',
    testTimeout: 30_000,
    hookTimeout: 60_000,
    // A page that waits on the server and a refetch can take seconds on a loaded 2-core machine; a
    // poll still fails when the state never comes.
    expect: { poll: { timeout: 10_000 } },
    globalSetup: ['tests/global-setup.ts'],
    maxWorkers: 2,
  },
});
