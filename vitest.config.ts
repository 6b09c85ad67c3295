import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    // One throwaway PostgreSQL cluster on 127.0.0.1 for the whole run, stopped at the end.
    globalSetup: ['test/support/postgres-global-setup.ts'],
    projects: [
      {
        test: {
          name: 'unit',
          include: ['test/**/*.test.ts'],
          exclude: ['test/e2e/**', 'node_modules/**'],
          environment: 'node',
          testTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
