import { defineConfig } from 'vitest/config';

// Browser journeys against a running stack (api, admin); see e2e/support/browser.ts.
export default defineConfig({
  test: {
    environment: 'node',
    include: ['e2e/**/*.e2e.ts'],
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 120_000,
  },
});
