import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['src/**/*.spec.ts', 'test/**/*.e2e-spec.ts'],
    environment: 'node',
    globalSetup: ['test/support/browser-script.global-setup.ts'],
    testTimeout: 20_000,
    hookTimeout: 20_000,
  },
});
