import { defineConfig } from 'vitest/config';

// The workbench page: index.html at the repo root loads components/gt-workbench.ts;
// the render worker (src/worker/render-worker.ts) is bundled as an ES module worker.
// The test runner shares this file.
export default defineConfig({
  root: '.',
  build: {
    outDir: 'dist',
    target: 'es2022',
    sourcemap: true,
    // The sample recordings the demos name are served as files, never inlined.
    assetsInlineLimit: 0,
  },
  worker: { format: 'es' },
  // Pre-bundled up front so the dev server (npx vite) does not reload the page mid-session to optimise them.
  optimizeDeps: { include: ['lit', 'lit/decorators.js', 'uplot', 'idb-keyval', 'zod', 'fft.js'] },
  test: {
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/temp-root.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
