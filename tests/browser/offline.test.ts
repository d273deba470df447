import { afterAll, beforeAll, expect, it } from 'vitest'
import { call, demoEventId, login } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'
import { clearedEntry } from '../support/entries'
import { eventClockTime, minutesAgo } from '../support/runs'

// The run sheet with no network (Chromium's offline emulation through Playwright): what the timekeeper enters
// is kept on the device (IndexedDB) and sent, each write once, when the link returns; a write refused on
// arrival (the same trap timed meanwhile by another timekeeper) is shown and resolved. Common practice of
// record courses, where the timing hut often has no link; the machine and times are invented for the test.
let hut: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  hut = await launchBrowser()
})
afterAll(async () => {
  await hut?.browser.setOffline(false)
  await hut?.close()
})

it('keeps readings and a new run offline, sends each once when the link returns, and shows a conflict to resolve', async () => {
  const timekeeper = await login('timekeeper@trapline.test')
  const eventId = await demoEventId(timekeeper)
  const entryId = await clearedEntry(eventId, `Offline Kestrel ${Date.now()}`)
  const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: timekeeper })).body
  const trap = (label: string) => sheet.traps.find((t: any) => t.label === label).id
  const primary = sheet.systems.find((s: any) => s.role === 'primary').id
  const start = minutesAgo(10)
  const run = await call('POST', `/api/events/${eventId}/runs`, {
    cookie: timekeeper, body: { entryId, direction: 'out', startedAt: new Date(start).toISOString() },
  })
  expect(run.status).toBe(201)
  const zone = sheet.timeZone as string
  const at = (seconds: number) => eventClockTime(start + 60_000 + seconds * 1000, zone)

  const page = await signIn(hut, 'timekeeper@trapline.test', `/events/${eventId}/run-sheet`)
  // The service worker takes the page over; from then on the run sheet opens with no link too.
  await page.waitForFunction(() => !!navigator.serviceWorker?.controller, null, { timeout: 20_000 })
  await page.waitForFunction(async () => !!(await caches.match(location.href)), null, { timeout: 20_000 })
  await page.click(`[data-test="run-${run.body.id}"]`)
  await page.locator(`h2:has-text("Run #${run.body.id} ")`).waitFor()

  await hut.browser.setOffline(true)
  await expect.poll(() => page.locator('[data-test="outbox-link"]').innerText()).toContain('No link')
  // Signing needs the server: what is signed is what it holds.
  expect(await page.locator('[data-test="sign-needs-link"]').innerText()).toContain('Signing needs the link to the server')
  expect(await page.locator('button:has-text("Sign the timing sheet")').isDisabled()).toBe(true)
  await page.fill('[data-test="cell-K-in-primary"]', at(0))
  await page.keyboard.press('Enter')
  await page.locator('[data-test="queued-K-in-primary"]').waitFor()
  // Meanwhile another timekeeper times the same trap from the hut's other terminal.
  const theirs = await call('POST', `/api/runs/${run.body.id}/readings`, {
    cookie: timekeeper, body: { trapId: trap('K-in'), systemId: primary, time: at(0.5) },
  })
  expect(theirs.status).toBe(201)
  await page.fill('[data-test="cell-K-out-primary"]', at(9))
  await page.keyboard.press('Enter')
  await page.locator('[data-test="queued-K-out-primary"]').waitFor()
  // A new run, started with no link: kept on the device with this device's clock, and its first time.
  await page.selectOption('#sr-entry', String(entryId))
  await page.selectOption('#sr-direction', 'back')
  await page.click('button:has-text("Start the run")')
  // The server has no time for the first run yet (its times wait on this device): starting another asks first.
  expect(await page.locator('[data-test="confirm-start"]').innerText()).toContain(`Run #${run.body.id} of`)
  await page.click('[data-test="confirm-start-yes"]')
  await page.locator('h2:has-text("Run (waiting to send)")').waitFor()
  await page.fill('[data-test="cell-K-out-primary"]', at(1800))
  await page.keyboard.press('Enter')
  await page.locator('[data-test="queued-K-out-primary"]').waitFor()
  expect(await page.locator('[data-test="outbox-waiting"]').innerText()).toContain('4 waiting to send')

  // Reloaded with no link, the page comes from the service worker and the queue from the device.
  await page.reload()
  await page.waitForSelector('html[data-hydrated="true"]')
  expect(await page.locator('[data-test="outbox-waiting"]').innerText()).toContain('4 waiting to send')

  await hut.browser.setOffline(false)
  await page.evaluate(() => window.dispatchEvent(new Event('online')))
  await page.locator('[data-test="outbox-conflict"]').waitFor({ timeout: 15_000 })
  await expect.poll(() => page.locator('[data-test="outbox-waiting"]').count()).toBe(0)
  // One conflict only: the trap timed meanwhile. Everything else went in.
  const conflicts = await page.locator('[data-test="outbox-conflict"]').allInnerTexts()
  expect(conflicts, conflicts.join('\n')).toHaveLength(1)
  expect(conflicts[0]).toContain('already has a time')
  await expect.poll(() => page.locator('[data-test="outbox-waiting"]').count()).toBe(0)

  const after = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: timekeeper })).body
  const cell = (runId: number, label: string) => after.history.filter((h: any) => h.runId === runId && h.trapId === trap(label) && h.systemId === primary)
  expect(cell(run.body.id, 'K-out')).toHaveLength(1) // written exactly once
  expect(cell(run.body.id, 'K-in').map((h: any) => h.current)).toEqual([true]) // theirs stands for now
  const newRun = after.attempts.flatMap((a: any) => a.runs).find((r: any) => r.direction === 'back' && a_entry(after, r.id) === entryId)
  expect(newRun).toBeDefined()
  expect(cell(newRun.id, 'K-out')).toHaveLength(1)

  // The timekeeper keeps the time typed offline, as a correction with a reason.
  await page.fill('[data-test="outbox-conflict"] input', 'typed in the hut while the link was down')
  await page.click('button:has-text("Keep my time as a correction")')
  await expect.poll(() => page.locator('[data-test="outbox-conflict"]').count(), { timeout: 15_000 }).toBe(0)
  const kInNow = async () => (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: timekeeper })).body.history
    .filter((h: any) => h.runId === run.body.id && h.trapId === trap('K-in') && h.systemId === primary)
  await expect.poll(async () => (await kInNow()).length, { timeout: 15_000 }).toBe(2)
  const kIn = await kInNow()
  expect(kIn).toHaveLength(2)
  expect(kIn.find((h: any) => h.current).reason).toBe('typed in the hut while the link was down')
})

/** The entry of a run, from the sheet. */
function a_entry(sheet: any, runId: number) {
  return sheet.attempts.find((a: any) => a.runs.some((r: any) => r.id === runId)).entry.id
}
