import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import path from 'node:path';

const root = import.meta.dirname;

export default defineConfig({
  plugins: [react()],
  resolve: {
    alias: {
      '@': root,
      'server-only': path.join(root, 'tests/support/server-only-stub.ts'),
    },
  },
  test: {
    execArgv: ['--import', 'tsx'],
    pool: 'forks',
    env: { LOG_LEVEL: 'silent' },
    testTimeout: 30_000,
    hookTimeout: 60_000,
    projects: [
      {
        extends: true,
        test: { name: 'unit', include: ['tests/unit/**/*.test.{ts,tsx}'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'fuzz',
          include: ['tests/fuzz/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
        },
      },
      {
        extends: true,
        test: { name: 'soak', include: ['tests/soak/**/*.soak.test.ts'], environment: 'node' },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          exclude: ['tests/integration/payment-fake/**'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
        },
      },
      {
        // Tests of a tool: the local payment fake that the app's billing tests and the demo run against.
        extends: true,
        test: {
          name: 'tool',
          include: ['tests/integration/payment-fake/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
        },
      },
    ],
  },
});
