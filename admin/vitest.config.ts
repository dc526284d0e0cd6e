import { defineConfig, mergeConfig } from 'vitest/config';
import viteConfig from './vite.config.ts';

export default mergeConfig(
  viteConfig,
  defineConfig({
    test: {
      environment: 'jsdom',
      include: ['src/**/*.test.{ts,tsx}', 'src/**/*.spec.ts'],
      exclude: ['e2e/**', 'node_modules/**'],
      setupFiles: ['./src/test/setup-tests.ts'],
      restoreMocks: true,
      // Generous on shared CI machines; the waits below stay well inside it.
      testTimeout: 30_000,
    },
  }),
);
