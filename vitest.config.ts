import { defineConfig } from 'vitest/config';
import path from 'node:path';

// Two projects: `unit` (pure code, no services) and `integration` (real MariaDB on the test port,
// started by scripts/test.mjs). Browser tests run under Playwright, not here.
export default defineConfig({
  resolve: { alias: { '@': path.resolve(import.meta.dirname) } },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts', 'tests/property/**/*.test.ts'],
          environment: 'node',
          setupFiles: ['tests/support/seeded-properties.ts'],
          // Seeded property sweeps and 40-digit references can take several seconds on a busy 2-core
          // machine; a timeout is a hang detector here, never a speed check (speed lives in bench/).
          testTimeout: 30_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
