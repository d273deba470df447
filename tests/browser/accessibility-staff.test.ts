import { afterAll, beforeAll, describe, it } from 'vitest'
import { checkerFails, sweepRole, sweepSetup, sweepSignedOut } from '../support/accessibility'

// Accessibility of the pages seen signed out and by the organiser, timekeeper and site administrator: WCAG 2.1
// A and AA by axe-core, each page in the day theme at 1280 px and the night theme at 390 px, on an event of the
// sweep's own (tests/support/accessibility.ts). The sweep is split in two files that run side by side.
let sweep: Awaited<ReturnType<typeof sweepSetup>>
beforeAll(async () => {
  sweep = await sweepSetup()
}, 120_000)
afterAll(async () => {
  await sweep?.ctx.close()
})

describe('accessibility in both themes', () => {
  it('the checker fails a page with a serious violation put into it', () => checkerFails(sweep))

  it('pages seen signed out have no serious or critical accessibility violation', () => sweepSignedOut(sweep), 240_000)

  it.each(['organiser', 'timekeeper', 'admin'] as const)('every page the %s reaches has no serious or critical accessibility violation',
    role => sweepRole(sweep, role), 300_000)
})
