import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
};

/**
 * A worker per core for the pure-computation and jsdom files: Vitest's default keeps a core for
 * itself, which on a 2-core machine ran them one at a time while its main process mostly waited.
 */
const BOTH_CORES = { maxWorkers: Math.max(2, os.availableParallelism() - 1) };

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          include: ['tests/shared/**/*.test.ts'],
          environment: 'node',
          ...BOTH_CORES,
          // property and exhaustive-oracle tests: generous, since CI machines are small
          testTimeout: 60000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'server',
          include: ['tests/server/**/*.test.ts'],
          environment: 'node',
          // after the unit and client files, with Vitest's default workers (one file at a time on
          // 2 cores): its health-latency guards time the request thread, which a second test file
          // on the same cores stretches
          sequence: { groupOrder: 1 },
          setupFiles: ['tests/setup/server-env.ts'],
          testTimeout: 60000,
          hookTimeout: 30000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'client',
          include: ['tests/client/**/*.test.{ts,tsx}'],
          environment: 'jsdom',
          ...BOTH_CORES,
          setupFiles: ['tests/setup/client-env.ts'],
          // property tests render many cases: generous, since CI machines are small and shared
          testTimeout: 30000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/e2e/global-setup.ts'],
          testTimeout: 120000,
          hookTimeout: 180000,
          fileParallelism: false,
        },
      },
    ],
  },
});
