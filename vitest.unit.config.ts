import { defineConfig } from 'vitest/config'
import { fileURLToPath } from 'node:url'

// The unit tests alone, with no projects: what mutation testing runs (scripts/mutation.sh), since the
// pure code of shared/ must be pinned by the unit tests and nothing else.
const shared = fileURLToPath(new URL('./shared', import.meta.url))

export default defineConfig({
  resolve: { alias: { '#shared': shared } },
  test: {
    include: ['tests/unit/**/*.test.ts'],
    environment: 'node',
    expect: { requireAssertions: true },
  },
})
