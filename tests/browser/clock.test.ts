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

it('a start typed in the hour repeated when the clocks go back asks which; one in the hour they skip is refused', async () => {
  // America/Denver (the demo's zone) went back from 02:00 MDT (UTC−6) to 01:00 MST (UTC−7) on 1 November 2026, and
  // forward from 02:00 MST to 03:00 MDT on 8 March 2026 (IANA time zone database).
  const page = await signIn(ctx, 'timekeeper@trapline.test', await demoEventPath('/run-sheet'))
  await page.selectOption('#sr-entry', { label: 'Larkspur Fennwick streamliner — Mara Quillfeather (Larkspur Works)' })
  await page.uncheck('#sr-now')
  await page.fill('#sr-start', '2026-11-01T01:30:00')
  const which = page.locator('[data-test="sr-repeated-hour"]')
  await which.waitFor()
  expect(await which.innerText()).toMatch(/01:30 happened twice that night\. Which one\?[\s\S]*The first \(UTC−06:00\)[\s\S]*The second \(UTC−07:00\)/)
  await page.fill('#sr-start', '2026-03-08T02:30:00')
  expect(await which.count()).toBe(0)
  await page.click('button:has-text("Start the run")')
  const error = page.locator('#sr-start-error')
  await error.waitFor()
  expect(await error.innerText()).toContain('there was no 02:30 on 2026-03-08 in America/Denver: the clocks skipped that hour')
})
