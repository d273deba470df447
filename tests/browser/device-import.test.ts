import { afterAll, beforeAll, expect, it } from 'vitest'
import { call, demoEventId, login } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'
import { clearedEntry } from '../support/entries'
import { eventClockTime } from '../support/runs'

// The timekeeper imports a timing device's own event list on the run sheet: the file is read by the channel
// map, each passing shown with the run it goes to, then written. Invented machine and times; 1000 m in
// 8.9000 s is 404.494 km/h (v = d / t, 1 km/h = 1/3.6 m/s, truncated to 3 decimals).
let hut: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  hut = await launchBrowser()
})
afterAll(async () => {
  await hut?.close()
})

it('shows where each passing of a device file goes, lists an unknown channel, and writes on confirmation', async () => {
  const timekeeper = await login('timekeeper@trapline.test')
  const eventId = await demoEventId(timekeeper)
  const entryId = await clearedEntry(eventId, `Device Wren ${Date.now()}`)
  const run = await call('POST', `/api/events/${eventId}/runs`, { cookie: timekeeper, body: { entryId, direction: 'out' } })
  expect(run.status).toBe(201)
  const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: timekeeper })).body
  // The form's default map: channel n is the n-th trap of the sheet.
  const channel = (label: string) => String(sheet.traps.findIndex((t: any) => t.label === label) + 1)
  const start = Date.parse(run.body.startedAt)
  const at = (s: number) => eventClockTime(start + 60_000 + s * 1000, sheet.timeZone)
  const file = ['channel,time', `${channel('K-in')},${at(0)}`, `99,${at(4)}`, `${channel('K-out')},${at(8.9)}`].join('\n')

  const page = await signIn(hut, 'timekeeper@trapline.test', `/events/${eventId}/run-sheet`)
  await page.click('[data-test="imports"] summary')
  await page.locator('[data-test="device-import"]').waitFor()
  await page.selectOption('#dev-system', { label: `${sheet.systems.find((s: any) => s.role === 'primary').name} (primary)` })
  await page.setInputFiles('#dev-file', { name: 'wren-device.txt', mimeType: 'text/plain', buffer: Buffer.from(file) })
  await page.locator(`[data-test="device-run-${run.body.id}"]`).waitFor()
  const preview = await page.locator(`[data-test="device-run-${run.body.id}"]`).innerText()
  expect(preview).toContain('K-in')
  expect(preview).toContain('K-out')
  expect(await page.locator('[data-test="device-unmatched"]').innerText()).toContain('channel 99 is not in the channel map')
  let live = (await call('GET', `/api/events/${eventId}/live`, { cookie: timekeeper })).body
  expect(live.flatMap((a: any) => a.runs).find((r: any) => r.id === run.body.id).official).toBeNull() // nothing written yet

  await page.click('[data-test="device-write"]')
  await page.locator('text=2 readings written from wren-device.txt.').waitFor()
  live = (await call('GET', `/api/events/${eventId}/live`, { cookie: timekeeper })).body
  expect(live.flatMap((a: any) => a.runs).find((r: any) => r.id === run.body.id).official.kmh).toBe('404.494')
  const written = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: timekeeper })).body.history
    .filter((h: any) => h.runId === run.body.id)
  expect(written).toHaveLength(2)
  expect(written.every((h: any) => h.sourceEvidenceId)).toBe(true)
})
