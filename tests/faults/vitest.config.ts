import { defineConfig } from 'vitest/config';

// Fault injection on the real stack (MariaDB, SMTP fake, the server's processes behind nginx). Each
// file runs a stack of its own, one file at a time: the faults are machine-wide (killed processes, a
// full disk) and the machine has two cores. Every wait in them is bounded.
export default defineConfig({
  test: {
    include: ['tests/faults/**/*.fault.test.ts'],
    testTimeout: 180_000,
    hookTimeout: 300_000,
    fileParallelism: false,
    pool: 'forks',
  },
});
