import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
};

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
