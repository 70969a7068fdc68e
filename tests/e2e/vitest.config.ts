import { defineConfig } from 'vitest/config';

// Browser tests: one file drives the whole product (build, MariaDB, API, SMTP fake, Chromium).
export default defineConfig({
  test: {
    include: ['tests/e2e/**/*.e2e.test.ts'],
    testTimeout: 240_000,
    hookTimeout: 300_000,
    fileParallelism: false,
    pool: 'forks',
  },
});
