import type { Page } from 'playwright-core'

/**
 * On the run sheet: starts a run for the demo streamliner (optionally some minutes ago) and types
 * the primary system's four trap times with the keyboard, Enter after each. Returns the run's id.
 */
export async function enterRun(page: Page, direction: 'out' | 'back', times: string[], minutesAgo?: number) {
  await page.selectOption('#sr-entry', { label: 'Larkspur Fennwick streamliner — Mara Quillfeather (Larkspur Works)' })
  if (minutesAgo !== undefined) {
    const start = await page.evaluate((m) => {
      const d = new Date(Date.now() - m * 60_000)
      d.setSeconds(0, 0)
      return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 19)
    }, minutesAgo)
    await page.fill('#sr-start', start)
  }
  await page.selectOption('#sr-direction', direction)
  const started = page.waitForResponse(r => r.url().endsWith('/runs') && r.request().method() === 'POST')
  await page.click('button:has-text("Start the run")')
  const runId = (await (await started).json()).id as number
  await page.locator(`h2:has-text("Run #${runId} ")`).waitFor()
  const order = direction === 'out' ? ['M-in', 'K-in', 'K-out', 'M-out'] : ['M-out', 'K-out', 'K-in', 'M-in']
  await page.locator(`[data-test="cell-${order[0]}-primary"]`).focus()
  for (const [i, label] of order.entries()) {
    await page.keyboard.type(times[i]!)
    await page.keyboard.press('Enter')
    await page.locator(`[data-test="value-${label}-primary"]`).waitFor()
  }
  return runId
}
