import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 240_000,
    // Worker threads that keep their module cache between test files: React, Fluent UI, exceljs and the engine are
    // imported once per worker instead of once per file, which halves the suite's time on two cores. Test files
    // must therefore leave no global state behind (each cleans up in afterEach/afterAll); a run in shuffled
    // file order (`npx vitest run --sequence.shuffle.files --sequence.shuffle.tests=false`) is how to check that.
    pool: 'threads',
    isolate: false,
  },
});
