import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

const shared = fileURLToPath(new URL('./shared', import.meta.url))

/**
 * The pure unit tests, once per time zone: the rules engine takes every zone it needs as an argument, so
 * its results must not move with the machine's. UTC, a zone behind it with a clock change (Denver) and one
 * twelve to thirteen hours ahead with a clock change (Auckland); Node applies process.env.TZ when it is set.
 */
const UNIT_ZONES = { 'unit': 'UTC', 'unit-denver': 'America/Denver', 'unit-auckland': 'Pacific/Auckland' }

// Projects: the unit tests in three time zones, and end-to-end tests (API and browser) against the built
// server and a real PostgreSQL, started once by the global setup. Every test must assert something; a
// poll waits long enough for a server round trip on a slow machine and asks often.
export default defineConfig({
  resolve: { alias: { '#shared': shared } },
  test: {
    expect: { requireAssertions: true, poll: { timeout: 10_000, interval: 50 } },
    projects: [
      ...Object.entries(UNIT_ZONES).map(([name, zone]) => ({
        extends: true as const,
        test: {
          name,
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          env: { TZ: zone },
          benchmark: { include: ['tests/bench/**/*.bench.ts'] },
        },
      })),
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          fileParallelism: process.env.TRAPLINE_E2E_WORKERS !== undefined && process.env.TRAPLINE_E2E_WORKERS !== '1',
          maxWorkers: Number(process.env.TRAPLINE_E2E_WORKERS ?? 1),
        },
      },
    ],
  },
})
