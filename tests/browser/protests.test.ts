import { afterAll, beforeAll, expect, it } from 'vitest'
import type { BrowserContext } from 'playwright-core'
import { call } from '../support/api'
import { launchBrowser, open } from '../support/browser'
import { clearedEntry } from '../support/entries'
import { makeReady } from '../support/ready-attempt'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

// A protest from lodging to decision in the browser: the team lodges it against a published result on the protests
// page (signed, with the deadline on the event's clock); the steward records the hearing and dismisses it, signed;
// the team sees the decision and may appeal. International profile: 30 min after publication (from memory of the
// sporting codes, a setting of the profile). Invented set-up.
let ctx: Awaited<ReturnType<typeof launchBrowser>>
let event: TestEvent
let attemptId: number
beforeAll(async () => {
  ctx = await launchBrowser()
  event = await newTestEvent('intl-motorcycle', 'Europe/Lisbon')
  const entryId = await clearedEntry(event.eventId, 'Browser Protest Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] }
  const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', t0, quick)
  const back = await kilometreRun(place, entryId, 'back', t0 + 120_000, quick)
  await makeReady(event, out.attemptId, [out.id, back.id], entryId)
  attemptId = out.attemptId
  // The event's official is appointed steward by makeReady (the stewards confirm the result there).
  const official = (await call('GET', '/api/me', { cookie: event.cookie.official })).body.user.id
  const { appointments } = (await call('GET', `/api/events/${event.eventId}/officials`, { cookie: event.cookie.organiser })).body
  expect(appointments).toContainEqual(expect.objectContaining({ function: 'steward', userId: official, endedAt: null }))
})
afterAll(async () => {
  await ctx?.close()
})

async function as(browser: BrowserContext, cookie: string) {
  await browser.clearCookies()
  await browser.addCookies(cookie.split('; ').map((c) => {
    const [name, ...value] = c.split('=')
    return { name: name!, value: value.join('='), url: ctx.baseUrl }
  }))
}

it('is lodged by the team, heard and decided by the steward, and the decision shown to the team', async () => {
  await as(ctx.browser, event.cookie.team)
  let page = await open(ctx.browser, `${ctx.baseUrl}/events/${event.eventId}/protests`)
  expect(await page.locator('[data-test="protest-rule"]').innerText())
    .toContain('protest within 30 min of publication')
  const form = page.locator('[data-test="protest-form"]')
  // Sent empty: each field says what it needs, nothing is lodged.
  await form.getByRole('button', { name: 'Sign and lodge the protest' }).click()
  await expect.poll(() => form.locator('[role="alert"]').count()).toBeGreaterThan(0)
  await form.getByLabel('About the attempt').selectOption(String(attemptId))
  await form.getByLabel('Against').selectOption('timing')
  await form.getByLabel('Grounds').fill('The backup system missed the K-out beam on the back run.')
  await form.getByLabel('Full name, typed').fill('Test team')
  await form.getByLabel('Your password').fill('first-password-1')
  await form.getByRole('button', { name: 'Sign and lodge the protest' }).click()
  const card = page.locator('[data-test^="protest-"]').filter({ hasText: 'The backup system missed' })
  await card.waitFor()
  const lodged = await card.innerText()
  expect(lodged).toContain('By Test Team (Test team)')
  expect(lodged).toMatch(/due by \d\d:\d\d on \d{4}-\d\d-\d\d \(Europe\/Lisbon\)/)
  expect(await card.locator('[data-test="protest-state"]').innerText()).toContain('Open: awaiting the stewards')
  // The team cannot decide it.
  expect(await card.locator('[data-test^="decide-"]').count()).toBe(0)

  await as(ctx.browser, event.cookie.official)
  page = await open(ctx.browser, `${ctx.baseUrl}/events/${event.eventId}/protests`)
  const decide = page.locator('[data-test^="decide-"]').first()
  await decide.locator('summary').click()
  await decide.getByLabel('Heard or present').fill('Test Team; the chief timekeeper')
  await decide.getByLabel('The hearing, in short').fill('The backup printout shows the K-out time.')
  await decide.getByLabel('Decision').selectOption('dismissed')
  await decide.getByLabel('Reasons').fill('Both timing systems recorded the pass within tolerance.')
  await decide.getByLabel('Full name, typed').fill('Test official')
  await decide.getByLabel('Your password').fill('first-password-1')
  await decide.getByRole('button', { name: 'Sign the decision' }).click()
  // The decision and its consequence are read back; nothing is signed before the second press.
  const readBack = decide.locator('[data-test="read-back-text"]')
  expect(await readBack.innerText()).toMatch(/^Decide protest #\d+ as Test official: dismissed, and nothing is made void\. Heard at \d{4}-\d\d-\d\d \d\d:\d\d \(.+\)\. Reasons: “Both timing systems recorded the pass within tolerance\.”\. A signed decision is final\.$/)
  expect(await page.locator('[data-test="protest-state"]').first().innerText()).not.toContain('Dismissed')
  await decide.locator('[data-test="read-back-yes"]').click()
  await expect.poll(() => page.locator('[data-test="protest-state"]').first().innerText())
    .toContain('✕ Dismissed by Test official')

  await as(ctx.browser, event.cookie.team)
  page = await open(ctx.browser, `${ctx.baseUrl}/events/${event.eventId}/protests`)
  const decided = await page.locator('[data-test^="protest-"]').filter({ hasText: 'The backup system missed' }).innerText()
  expect(decided).toContain('Reasons: Both timing systems recorded the pass within tolerance.')
  expect(decided).toMatch(/May be appealed to the national court of appeal of the permit's issuer by \d\d:\d\d on/)
  expect(await page.locator('[data-test^="appeal-"]').count()).toBe(1)
  // The attempt's readiness now holds no open protest.
  const items = (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body.items
  expect(items.find((i: { key: string }) => i.key === 'protests')).toMatchObject({ met: true })
})
