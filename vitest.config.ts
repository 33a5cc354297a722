import { defineConfig } from 'vitest/config';
import preact from '@preact/preset-vite';

// One project per execution context, mirroring the tsconfig split.
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'core', include: ['tests/core/**/*.test.ts'], environment: 'node' } },
      { test: { name: 'cli', include: ['tests/cli/**/*.test.ts'], environment: 'node', testTimeout: 60_000 } },
      {
        plugins: [preact()],
        test: {
          name: 'app',
          include: ['tests/app/**/*.test.{ts,tsx}', 'tests/store/**/*.test.ts', 'tests/sync/**/*.test.ts'],
          environment: 'happy-dom',
          globals: true,
          setupFiles: ['tests/setup-dom.ts'],
        },
      },
      { test: { name: 'server', include: ['tests/server/**/*.test.ts'], environment: 'node', testTimeout: 60_000, hookTimeout: 60_000 } },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          testTimeout: 180_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
