import { defineConfig } from 'vitest/config';

// The workbench page lives in components/ (index.html at the repo root);
// the test runner shares this file.
export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
