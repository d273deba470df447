import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

const shared = fileURLToPath(new URL('./shared', import.meta.url))

// Two projects: pure unit tests, and end-to-end tests (API and browser) against the built server
// and a real PostgreSQL, started once by the global setup. Every test must assert something; a
// poll waits long enough for a server round trip on a slow machine and asks often.
export default defineConfig({
  resolve: { alias: { '#shared': shared } },
  test: {
    expect: { requireAssertions: true, poll: { timeout: 10_000, interval: 50 } },
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          benchmark: { include: ['tests/bench/**/*.bench.ts'] },
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
