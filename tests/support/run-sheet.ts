import type { Page } from 'playwright-core'
import { formatTimeOfDay, parseTimeOfDay } from '#shared/rules/timing'

/**
 * On the run sheet: starts a run for the demo streamliner (optionally some minutes ago) and types
 * the primary system's four trap times with the keyboard, Enter after each, then the backup's. Returns the run's id.
 */
export async function enterRun(page: Page, direction: 'out' | 'back', times: string[], minutesAgo?: number) {
  await page.selectOption('#sr-entry', { label: 'Larkspur Fennwick streamliner — Mara Quillfeather (Larkspur Works)' })
  const zone = (await page.locator('[data-test="start-run"]').getAttribute('data-time-zone'))!
  const startMs = Math.floor((Date.now() - (minutesAgo ?? 0) * 60_000) / 60_000) * 60_000
  if (minutesAgo !== undefined) {
    // Typed, as a timekeeper does for a run already under way: in the event's time zone, shown by the field.
    await page.uncheck('#sr-now')
    await page.fill('#sr-start', eventClock(startMs, zone).slice(0, 16).replace(' ', 'T') + ':00')
  }
  // The timing clock reads the time of day in the event's zone: the first trap a minute after the start,
  // the others as far after it as the times given.
  const clocked = shiftedTimes(times, eventClock(startMs + 60_000, zone).slice(11, 19))
  await page.selectOption('#sr-direction', direction)
  const started = page.waitForResponse(r => r.url().endsWith('/runs') && r.request().method() === 'POST')
  await page.click('button:has-text("Start the run")')
  const runId = (await (await started).json()).id as number
  await page.locator(`h2:has-text("Run #${runId} ")`).waitFor()
  const order = direction === 'out' ? ['M-in', 'K-in', 'K-out', 'M-out'] : ['M-out', 'K-out', 'K-in', 'M-in']
  // Then the backup's, at its 1/1000 s (the last digit dropped: within both systems' tolerances). Two systems time
  // every run: a time one lacks is a finding until the chief timekeeper writes why.
  for (const role of ['primary', 'backup'] as const) {
    await page.locator(`[data-test="cell-${order[0]}-${role}"]`).focus()
    for (const [i, label] of order.entries()) {
      await page.keyboard.type(role === 'primary' ? clocked[i]! : clocked[i]!.slice(0, -1))
      await page.keyboard.press('Enter')
      await page.locator(`[data-test="value-${label}-${role}"]`).waitFor()
    }
  }
  return runId
}

/** "YYYY-MM-DD hh:mm:ss" of an instant in a time zone. */
const eventClock = (ms: number, zone: string) => new Date(ms).toLocaleString('sv-SE', { timeZone: zone })

/** The times kept apart as given, the first one moved to `firstAt` (hh:mm:ss); at 1/10 000 s, as typed. */
function shiftedTimes(times: string[], firstAt: string) {
  const tps = 10_000n
  const day = 86_400n * tps
  const shift = parseTimeOfDay(firstAt, tps) - parseTimeOfDay(times[0]!, tps)
  return times.map(t => formatTimeOfDay((((parseTimeOfDay(t, tps) + shift) % day) + day) % day, tps))
}
