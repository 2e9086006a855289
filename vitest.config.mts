import { defineConfig } from 'vitest/config';
import path from 'node:path';

const alias = {
  '@': path.resolve(import.meta.dirname),
  'server-only': path.resolve(import.meta.dirname, 'tests/support/server-only-stub.ts'),
};

/**
 * Two projects:
 *  - unit: pure modules under tests/lib (no database, no server)
 *  - integration: API and browser tests against a real PostgreSQL and a real
 *    `next start` server, both started by tests/support/global-setup.ts
 */
export default defineConfig({
  resolve: { alias },
  test: {
    fileParallelism: false,
    projects: [
      {
        resolve: { alias },
        test: { name: 'unit', include: ['tests/lib/**/*.test.ts'], environment: 'node' },
      },
      {
        resolve: { alias },
        test: {
          name: 'integration',
          include: [
            'tests/api/**/*.test.ts',
            'tests/integration/**/*.test.ts',
            'tests/e2e/**/*.test.ts',
            'tests/security/**/*.test.ts',
          ],
          environment: 'node',
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
