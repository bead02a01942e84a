import { defineConfig } from 'vitest/config';

// Two projects: everything in Node, and the browser tests (test/e2e), whose global setup builds the
// renderer and serves it once per run. A run that selects no e2e file starts neither.
export default defineConfig({
  test: {
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
    projects: [
      { extends: true, test: { name: 'node', include: ['test/**/*.test.ts'], exclude: ['test/e2e/**'] } },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          globalSetup: ['test/e2e/global-setup.ts'],
          // One browser at a time: two cores are shared with the rest of the suite.
          fileParallelism: false,
        },
      },
    ],
  },
});
