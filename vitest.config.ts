import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vitest/config';

const alias = {
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
  '@': fileURLToPath(new URL('./src', import.meta.url)),
};
const stack = './tests/setup/global-setup.ts';

// One project per kind of test. `npm test` runs them all; `vitest run --project <name>` runs one.
export default defineConfig({
  resolve: { alias },
  test: {
    reporters: ['default'],
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          environment: 'node',
          include: ['shared/**/*.test.ts', 'simulator/**/*.test.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'server',
          environment: 'node',
          include: ['server/**/*.test.ts', 'worker/**/*.test.ts', 'tests/integration/**/*.test.ts', 'tests/ingest/**/*.test.ts', 'tests/setup/**/*.test.ts'],
          globalSetup: [stack],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        plugins: [react()],
        resolve: { alias },
        test: {
          name: 'client',
          environment: 'jsdom',
          include: ['src/**/*.test.{ts,tsx}'],
          setupFiles: ['./src/test/setup.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.e2e.test.ts'],
          globalSetup: [stack, './tests/setup/build-client.ts'],
          testTimeout: 90_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'faults',
          environment: 'node',
          include: ['tests/faults/**/*.test.ts', 'tests/fuzz/**/*.test.ts'],
          globalSetup: [stack],
          testTimeout: 180_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
