import { afterAll, beforeAll, expect, it } from 'vitest'
import { PDFDocument } from 'pdf-lib'
import { demoEventPath, useTestServer } from '../support/api'
import { launchBrowser, open, signIn } from '../support/browser'

await useTestServer()
let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

it('a team picks its class from the profile\'s list and claims two distances timed on the same passes', async () => {
  const page = await signIn(ctx, 'team2@trapline.test', await demoEventPath('/entries'))
  await page.fill('#en-machine', 'Cinder Pairline')
  await page.fill('#en-mass', '199.5')
  await page.selectOption('#en-division', 'partial')
  await page.fill('#en-rider', 'Jory Vantreese')
  await page.fill('#en-licence', 'DEMO-L-0991')
  await page.fill('#en-expires', '2099-06-30')
  // The classes come from the event's rule profile (FIM extract, seen: electric by streamlining division).
  const classes = await page.locator('#en-class option').allInnerTexts()
  expect(classes).toContain('Electric, partially streamlined')
  await page.selectOption('#en-class', 'Electric, partially streamlined')
  // The first distance the profile allows is ticked; the kilometre inside the mile is claimed as well.
  expect(await page.locator('[data-test="claim-Flying mile"]').isChecked()).toBe(true)
  await page.locator('[data-test="claim-Flying kilometre"]').check()
  await page.getByRole('button', { name: 'Enter', exact: true }).click()
  const card = page.locator('article', { hasText: 'Cinder Pairline' })
  await card.waitFor()
  expect(await card.innerText()).toContain('Flying mile and Flying kilometre')
  // The demo's book: 330.000 km/h over the kilometre for this class (invented), nothing over the mile.
  const records = await card.locator('[data-test="entry-record"]').allInnerTexts()
  expect(records).toEqual([
    expect.stringContaining('Flying mile, standing record to beat: none in the book'),
    expect.stringContaining('Flying kilometre, standing record to beat: 330.000 km/h'),
  ])
})

it('the public record book filters, shows a vacant class\'s minimum, and hands over the holder\'s certificate', async () => {
  await ctx.browser.clearCookies()
  const page = await open(ctx.browser, `${ctx.baseUrl}/record-book`)
  const mile = page.locator('[data-test="record"]', { hasText: 'Electric, fully streamlined · Flying mile' }).first()
  await mile.waitFor()
  // Ratified by the event's officials (the demo's first version is homologated too; other tests may ratify newer ones).
  expect(await mile.locator('[data-test="status"]').innerText()).toMatch(/^✓.*(ratified by the event's officials|homologated)/)
  await mile.locator('summary').click()
  // The record entered before the event, 239.227 mph (invented for the demo), is among its previous holders.
  expect(await mile.locator('[data-test="previous-holder"]').allInnerTexts())
    .toContainEqual(expect.stringContaining('= 239.227 mph, entered by the organiser'))
  expect(await page.locator('[data-test="vacant"]').innerText()).toMatch(/Electric, unstreamlined · Flying kilometre[\s\S]*250\.000 km\/h/i)

  // Filters live in the address; only the kilometre is left.
  await page.selectOption('#rb-distance', 'Flying kilometre')
  await page.waitForURL('**distance=Flying*')
  await expect.poll(async () => {
    const shown = await page.locator('[data-test="record"] .eyebrow').allTextContents()
    return shown.length > 0 && shown.every(t => t.trim().endsWith('Flying kilometre'))
  }).toBe(true)
  expect(await page.locator('a', { hasText: 'CSV' }).getAttribute('href')).toBe('/api/record-book.csv?distance=Flying+kilometre')
  await page.selectOption('#rb-distance', '')

  // The holder's certificate, anyone's to download: one page, titled with what it certifies (read back with pdf-lib).
  const href = await page.locator('[data-test="record"]', { hasText: 'Electric, fully streamlined · Flying mile' })
    .first().getByRole('link', { name: 'Holder\'s certificate' }).getAttribute('href')
  const res = await page.request.get(href!)
  expect(res.headers()['content-type']).toBe('application/pdf')
  const doc = await PDFDocument.load(await res.body())
  expect(doc.getPageCount()).toBe(1)
  expect(doc.getTitle()).toBe('Record certificate: Electric, fully streamlined, Flying mile')

  // Readable on a phone: 390 px wide, no sideways scrolling.
  await page.setViewportSize({ width: 390, height: 844 })
  expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390)
})
