import swc from 'unplugin-swc';
import { defineConfig } from 'vitest/config';

// SWC compiles the decorators (and their metadata) that NestJS and TypeORM rely on.
const plugins = [swc.vite({ module: { type: 'es6' } })];

export default defineConfig({
  test: {
    projects: [
      {
        plugins,
        // Generous: property tests simulate thousands of studies, and CI machines are shared.
        test: { name: 'unit', include: ['src/**/*.spec.ts'], environment: 'node', testTimeout: 60_000 },
      },
      {
        plugins,
        test: {
          name: 'e2e',
          include: ['test/**/*.e2e-spec.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
          globalSetup: ['test/global-setup.ts'],
        },
      },
    ],
  },
});
