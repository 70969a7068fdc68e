import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    globalSetup: ['test/global-setup.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Each file builds its own app and organisation, so files may share one database.
    pool: 'forks',
    // Release verification finds no simulator or yosys unless a test file sets its own PATH for them
    // (test/releases/verification.test.ts runs the real ones); the others then verify in milliseconds.
    env: { LW_VERIFY_PATH: '' },
  },
});
