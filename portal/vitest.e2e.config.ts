import { defineConfig } from 'vitest/config';

// Browser journeys against a running stack (portal, api, mailbox); see e2e/support/env.ts for the addresses.
export default defineConfig({
  test: {
    environment: 'node',
    include: ['e2e/**/*.e2e.ts'],
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 60_000,
  },
});
