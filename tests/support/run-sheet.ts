import type { Page } from 'playwright-core'

/**
 * On the run sheet: starts a run for the demo streamliner (optionally some minutes ago) and types
 * the primary system's four trap times with the keyboard, Enter after each. Returns the run's id.
 */
export async function enterRun(page: Page, direction: 'out' | 'back', times: string[], minutesAgo?: number) {
  await page.selectOption('#sr-entry', { label: 'Larkspur Fennwick streamliner — Mara Quillfeather (Larkspur Works)' })
  if (minutesAgo !== undefined) {
    // Typed, as a timekeeper does for a run already under way: in the event's time zone, shown by the field.
    await page.uncheck('#sr-now')
    const zone = await page.locator('#sr-start').getAttribute('data-time-zone')
    const start = new Date(Date.now() - minutesAgo * 60_000)
      .toLocaleString('sv-SE', { timeZone: zone! }).replace(' ', 'T').slice(0, 16) + ':00'
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
