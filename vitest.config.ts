import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

const shared = fileURLToPath(new URL('./shared', import.meta.url))

/**
 * The pure unit tests, once per time zone: the rules engine takes every zone it needs as an argument, so
 * its results must not move with the machine's. UTC, a zone behind it with a clock change (Denver) and one
 * twelve to thirteen hours ahead with a clock change (Auckland); Node applies process.env.TZ when it is set.
 */
const UNIT_ZONES = { 'unit': 'UTC', 'unit-denver': 'America/Denver', 'unit-auckland': 'Pacific/Auckland' }

/**
 * End-to-end files that work only on test events and people of their own (or on nothing shared), never change
 * what another file reads, never stop a shared service, and sign no demo person out: these run two at a time.
 * Every other e2e file runs alone, after them. A file goes on this list only once it is so.
 */
const E2E_ISOLATED = [
  'tests/api/calculator.test.ts', 'tests/api/classes.test.ts', 'tests/api/club-procedure.test.ts',
  'tests/api/corrections.test.ts', 'tests/api/device-import.test.ts', 'tests/api/idempotency.test.ts', 'tests/api/independence.test.ts',
  'tests/api/live-stream.test.ts', 'tests/api/machines.test.ts', 'tests/api/notices.test.ts',
  'tests/api/officials.test.ts', 'tests/api/passkeys.test.ts', 'tests/api/payments.test.ts',
  'tests/api/post-run-check.test.ts', 'tests/api/protests.test.ts', 'tests/api/s3-store.test.ts',
  'tests/api/speed-reached.test.ts', 'tests/api/start-line.test.ts', 'tests/api/two-servers.test.ts',
  'tests/browser/post-run-check.test.ts', 'tests/browser/day-screens-roles.test.ts', 'tests/api/board.test.ts',
  'tests/browser/accessibility-field.test.ts', 'tests/browser/accessibility-staff.test.ts',
  'tests/browser/calculator.test.ts', 'tests/browser/payments.test.ts',
  'tests/browser/protests.test.ts',
]
const E2E_TIMEOUTS = { testTimeout: 60_000, hookTimeout: 120_000 }

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
      // The isolated files first, two at a time, then the others one at a time: one server for both projects.
      {
        extends: true,
        test: {
          name: 'e2e-isolated',
          include: E2E_ISOLATED,
          globalSetup: ['tests/support/global-setup.ts'],
          ...E2E_TIMEOUTS,
          fileParallelism: true,
          maxWorkers: 2,
          sequence: { groupOrder: 1 },
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/api/**/*.test.ts', 'tests/browser/**/*.test.ts'],
          exclude: E2E_ISOLATED,
          globalSetup: ['tests/support/global-setup.ts'],
          ...E2E_TIMEOUTS,
          fileParallelism: false,
          // One worker takes the files one after another without a fresh module graph each (no file mocks here):
          // the imports and set-up of each file are paid once.
          isolate: false,
          sequence: { groupOrder: 2 },
        },
      },
    ],
  },
})
