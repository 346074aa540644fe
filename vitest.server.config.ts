import { defineConfig } from 'vitest/config';

/** Server, estimation and seed tests: real SQLite files, real HTTP through createApp(). */
export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    exclude: ['tests/e2e/**', 'node_modules/**'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
