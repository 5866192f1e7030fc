import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { defineConfig } from 'vitest/config';

/** Test files under test/, relative to the repository root. */
function testFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const path = join(dir, e.name);
    if (e.isDirectory()) return testFiles(path);
    return /\.test\.tsx?$/.test(e.name) ? [path] : [];
  });
}

/** Files that ask for a DOM (`// @vitest-environment jsdom`) run isolated, each in a fresh module graph: Fluent UI's
 * focus manager keeps a mutation observer on the document, which must not outlive the file's jsdom environment. */
const DOM_FILES = testFiles('test').filter((f) => readFileSync(f, 'utf8').includes('@vitest-environment jsdom'));

const shared = { testTimeout: 60_000, hookTimeout: 240_000, pool: 'threads' as const };

export default defineConfig({
  test: {
    projects: [
      {
        // Every other file runs in worker threads that keep their module cache between files: exceljs, fast-check
        // and the engine are imported once per worker instead of once per file, which halves the suite's time on two
        // cores. These files must leave no global state behind (each cleans up in afterEach/afterAll); a run in
        // shuffled file order (`npx vitest run --sequence.shuffle.files --sequence.shuffle.tests=false`) checks that.
        test: { ...shared, name: 'node', include: ['test/**/*.test.ts'], exclude: DOM_FILES, environment: 'node', isolate: false },
      },
      {
        test: { ...shared, name: 'dom', include: DOM_FILES, isolate: true },
      },
    ],
  },
});
