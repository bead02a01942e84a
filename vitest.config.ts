import { defineConfig } from 'vitest/config';

// Three projects: everything in Node; the integration tests (test/integration: a real Slurm cluster
// on localhost), one file at a time; and the browser tests (test/e2e), whose global setup builds the
// renderer and serves it once per run. Projects without file parallelism run after the parallel
// ones, one file at a time, so the heavy tests never share the two cores with each other.
export default defineConfig({
  test: {
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: 'forks',
    projects: [
      { extends: true, test: { name: 'node', include: ['test/**/*.test.ts'], exclude: ['test/e2e/**', 'test/integration/**'] } },
      {
        extends: true,
        test: { name: 'node-serial', include: ['test/integration/**/*.test.ts'], fileParallelism: false },
      },
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
