import type { BrowserContext } from 'playwright-core'
import { afterAll, beforeAll, expect, it } from 'vitest'
import { launchBrowser, open } from '../support/browser'

let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

it('computes the 1983 flying mile as one types, without signing in', async () => {
  // Source: 1983 land speed record (Royal Automobile Club and others): 5.767 s and 5.599 s → 633.468 mph.
  const page = await open(ctx.browser as BrowserContext, `${ctx.baseUrl}/calculator`)
  await page.selectOption('#c-profile', 'intl-automobile')
  await page.selectOption('#c-distance', '1609.344')
  await page.getByRole('button', { name: 'mph' }).click()
  await page.fill('#r0-time', '5.767')
  await page.locator('[data-test="return-target"]').waitFor({ state: 'detached' }).catch(() => {})
  await page.fill('#c-record', '630.388')
  // One run: the return-run target appears. 630.388 × 1.01 → 636.692 mph needed; 2 × 3600 / 636.692 − 5.767 = 5.541… s.
  await page.locator('[data-test="return-target"]').waitFor()
  expect(await page.locator('[data-test="return-target"]').innerText()).toContain('5.541')
  await page.fill('#r1-time', '5.599')
  await expect.poll(() => page.locator('[data-test="result-primary"]').innerText()).toContain('633.468')
  expect(await page.locator('[data-test="result-secondary"]').innerText()).toContain('1019.468 km/h')
  expect(await page.locator('[data-test="calc-result"]').innerText()).toContain('Does not count as a record')
  await page.fill('#r1-time', '-1')
  await expect.poll(() => page.locator('#r1-time-error').innerText()).toContain('greater than zero')
  await page.close()
})
