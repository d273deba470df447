import { afterAll, beforeAll, expect, it } from 'vitest'
import { pdf, png, sha256 } from '../support/files'
import { demoEventPath } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'

let ctx: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  ctx = await launchBrowser()
})
afterAll(async () => {
  await ctx?.close()
})

it('uploads two files, shows their progress and hashes, and opens them in the viewer', async () => {
  const page = await signIn(ctx, 'organiser@trapline.test', await demoEventPath('/evidence'))
  await page.selectOption('#ev-kind', 'other-document')

  const certificate = pdf('browser upload')
  await page.locator('[data-test="file-input"]').setInputFiles([
    { name: 'scale certificate.pdf', mimeType: 'application/pdf', buffer: certificate },
    { name: 'start line.png', mimeType: 'image/png', buffer: png },
  ])
  for (const [name, bytes] of [['scale certificate.pdf', certificate], ['start line.png', png]] as const) {
    const row = page.locator(`[data-test="upload-${name}"]`)
    await expect.poll(() => row.locator('[data-test="upload-state"]').innerText().catch(() => ''), { timeout: 10_000 }).toContain('Stored')
    expect(await row.locator('progress').getAttribute('value')).toBe('100')
    expect(await row.locator('[data-test="upload-hash"]').innerText()).toBe(`SHA-256 ${sha256(bytes)}`)
  }
  // The library lists both with their hashes; the viewer opens the image and the PDF in the page.
  const image = page.locator('[data-test="evidence-start line.png"]')
  await image.waitFor()
  expect(await image.locator('[data-test="hash"]').innerText()).toBe(sha256(png))
  await image.getByRole('button', { name: 'View start line.png' }).click()
  await expect.poll(() => page.locator('img[data-test="viewer"]').evaluate(el => (el as HTMLImageElement).naturalWidth)).toBe(1)
  await page.getByRole('button', { name: 'Close' }).click()
  await page.locator('[data-test="evidence-scale certificate.pdf"]').getByRole('button', { name: 'View', exact: true }).click()
  expect(await page.locator('iframe[data-test="viewer"]').getAttribute('src')).toMatch(/^\/api\/evidence\/\d+\/content$/)
})
