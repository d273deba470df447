import { afterAll, beforeAll, expect, it } from 'vitest'
import { call } from '../support/api'
import { launchBrowser, open } from '../support/browser'
import { clearedEntry } from '../support/entries'
import { newTestEvent, type TestEvent } from '../support/test-event'

// A team pays its entry fee in the browser: the pay button, the provider's hosted page (the local fake), back to
// the entries page, where the fee shows paid once the provider's webhook has come.
let ctx: Awaited<ReturnType<typeof launchBrowser>>
let event: TestEvent
let entryId: number
beforeAll(async () => {
  ctx = await launchBrowser()
  event = await newTestEvent('intl-motorcycle', 'UTC')
  entryId = await clearedEntry(event.eventId, 'Browser Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const fees = await call('PUT', `/api/events/${event.eventId}/fees`, {
    cookie: event.cookie.organiser, body: { currency: 'eur', entryMinor: 15000, recordMinor: 2500 },
  })
  expect(fees.status).toBe(200)
})
afterAll(async () => {
  await ctx?.close()
})

it('pays the entry fee through the provider\'s page and sees it paid, with its receipt', async () => {
  await ctx.browser.clearCookies()
  await ctx.browser.addCookies(event.cookie.team.split('; ').map((c) => {
    const [name, ...value] = c.split('=')
    return { name: name!, value: value.join('='), url: ctx.baseUrl }
  }))
  const page = await open(ctx.browser, `${ctx.baseUrl}/events/${event.eventId}/entries`)
  const fees = page.locator(`[data-test="fees-${entryId}"]`)
  // Amounts always with their currency: 150.00 EUR entry, 25.00 EUR per claim (one claim).
  expect(await fees.locator('[data-test="fee-entry"]').innerText()).toContain('Entry fee: 150.00 EUR · not paid')
  expect(await fees.locator('[data-test="fee-record"]').innerText()).toContain('Record application fee: 25.00 EUR')
  await fees.getByRole('button', { name: 'Pay the entry fee (150.00 EUR)' }).click()
  await page.locator('[data-test="pay"]').click()
  await page.waitForURL(`**/events/${event.eventId}/entries?paid=${entryId}`)
  await page.waitForSelector('html[data-hydrated="true"]')
  expect(await page.locator('[data-test="payment-return"]').innerText()).toContain('Back from the payment page')
  await expect.poll(() => page.locator(`[data-test="fees-${entryId}"] [data-test="fee-state-entry"]`).innerText(), { timeout: 15_000 })
    .toBe('✓ paid')
  expect(await page.locator(`[data-test="fees-${entryId}"]`).getByRole('link', { name: /Receipt R-\d+ \(PDF\)/ }).count()).toBe(1)
  await page.close()
})
