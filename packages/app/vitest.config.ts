import { defineConfig, mergeConfig } from 'vitest/config';
import viteConfig from './vite.config.ts';

export default mergeConfig(
  viteConfig,
  defineConfig({
    test: {
      environment: 'happy-dom',
      include: ['test/**/*.test.ts'],
      testTimeout: 30_000,
      // Element Plus components import their CSS; let vite handle it instead of Node.
      server: { deps: { inline: ['element-plus'] } },
    },
  }),
);
