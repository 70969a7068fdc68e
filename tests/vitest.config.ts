import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// Cross-package checks of the README's contract (the scripts, the project-local database, npm start).
export default defineConfig({
  root: fileURLToPath(new URL('.', import.meta.url)),
  test: {
    include: ['foundation/**/*.test.ts'],
    testTimeout: 240_000,
    hookTimeout: 240_000,
    fileParallelism: false,
  },
});
