// `npm run test:faults`: the slow tests of what happens when things go wrong or must be recovered
// (backup and restore, upgrading an old database's roles, and others' fault tests in tests/faults),
// against the same test cluster and database `npm test` prepares. One file at a time.
import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['tests/faults/**/*.test.ts'],
    fileParallelism: false,
    testTimeout: 300_000,
    hookTimeout: 300_000,
    setupFiles: ['tests/setup/env.ts'],
  },
});
