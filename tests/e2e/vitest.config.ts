import { defineConfig } from 'vitest/config';
import { fileURLToPath } from 'node:url';

export default defineConfig({
  // The app serves the mission page rendered on the server from the client's own components (src/entry-server.tsx),
  // which import through the client's path aliases.
  resolve: {
    alias: {
      '@shared': fileURLToPath(new URL('../../shared', import.meta.url)),
      '@': fileURLToPath(new URL('../../src', import.meta.url)),
    },
  },
  test: {
    include: ['tests/e2e/**/*.e2e.test.ts'],
    environment: 'node',
    globalSetup: ['tests/e2e/global-setup.ts'],
    testTimeout: 90_000,
    hookTimeout: 180_000,
    pool: 'forks',
    maxWorkers: 1,
    fileParallelism: false,
  },
});
