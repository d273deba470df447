import { afterAll, beforeAll, expect, it } from 'vitest'
import { demoEventPath, useTestServer } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'

await useTestServer()
let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

it('the run sheet shows the device\'s clock against the server\'s, and warns when it is more than 2 s off', async () => {
  const page = await signIn(ctx, 'timekeeper@trapline.test', await demoEventPath('/run-sheet'))
  const offset = page.locator('[data-test="clock-offset"]')
  await offset.waitFor()
  // This machine's clock is the server's: well within 2 s, no warning; the time is named by the event's zone.
  expect(await page.locator('[data-test="clock"]').innerText()).toContain('America/Denver')
  expect(await page.locator('[data-test="clock-warning"]').count()).toBe(0)
  // The device's clock set 5 minutes fast (Date.now shifted in the page): the offset reads about 300 s.
  await ctx.browser.addInitScript(() => {
    const real = Date.now
    Date.now = () => real() + 300_000
  })
  await page.reload()
  await page.waitForSelector('html[data-hydrated="true"]')
  const warning = page.locator('[data-test="clock-warning"]')
  await warning.waitFor()
  expect(await warning.innerText()).toContain('More than 2 s off')
  expect(await offset.innerText()).toMatch(/clock is 30\d\.\d s ahead of the server's|clock is 299\.\d s ahead of the server's/)
})
