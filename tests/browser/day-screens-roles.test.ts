import { afterAll, beforeAll, expect, it } from 'vitest'
import { electricMotorcycle } from '#shared/inspection/templates'
import { call } from '../support/api'
import { launchBrowser, openAs } from '../support/browser'
import { answerAll, clearedEntry, FIGURES, newEntry } from '../support/entries'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

// What each role is shown on the day's screens, in the night theme at 390 px and the day theme at 1280 px: a role sees
// only the buttons it may press; a label says what the act requires; a value outside its limit never reads "Passed".
// Invented set-up.
let ctx: Awaited<ReturnType<typeof launchBrowser>>
let event: TestEvent
let inspectionId: number
beforeAll(async () => {
  ctx = await launchBrowser()
  event = await newTestEvent('intl-motorcycle', 'UTC')
  const entryId = await newEntry(event.eventId, 'Leaky Sprite', {}, { team: event.cookie.team })
  const started = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
  expect(started.status, JSON.stringify(started.body)).toBe(201)
  inspectionId = started.body.id
  await call('PATCH', `/api/inspections/${inspectionId}`, { cookie: event.cookie.scrutineer, body: FIGURES })
  // Every item ticked "Pass"; the isolation measured at 20 kΩ on the 400 V DC bus: 50 Ω/V, under the 100 Ω/V needed
  // (UN ECE Regulation 100, 5.1.3).
  await answerAll(inspectionId, undefined, { scrutineer: event.cookie.scrutineer }, electricMotorcycle, { isolation: [20, 'kΩ'] })
  const signed = await call('POST', `/api/inspections/${inspectionId}/signatures`, { cookie: event.cookie.scrutineer, body: { password: 'first-password-1', typedName: 'Test scrutineer' } })
  expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  // Runs on two days: one two days ago (the event began then), one today.
  dated = await clearedEntry(event.eventId, 'Dated Sprite', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1' })
  const both = { primary: [0, 9] as [number, number], backup: [0, 9] as [number, number] }
  await kilometreRun({ ...event, timekeeper: event.cookie.timekeeper }, dated, 'out', twoDaysAgo, both)
  await kilometreRun({ ...event, timekeeper: event.cookie.timekeeper }, dated, 'back', Math.ceil(Date.now() / 1000) * 1000 + 1000, both)
})
const twoDaysAgo = Math.floor((Date.now() - 48 * 3600_000) / 1000) * 1000
let dated: number
afterAll(async () => {
  await ctx?.close()
})

const as = (cookie: string, path: string, theme: 'day' | 'dark', width: number) => openAs(ctx, cookie, path, theme, width)

it.each([['dark', 390], ['day', 1280]] as const)('in the %s theme at %i px, each role sees what it may do', async (theme, width) => {
  // A value under its limit: the row says "Failed (measured)" under the red verdict, never "Passed".
  let page = await as(event.cookie.scrutineer, `/inspections/${inspectionId}`, theme, width)
  const isolation = page.locator('[data-test="item-isolation"]')
  expect(await isolation.locator('[data-test="verdict"]').innerText()).toContain('50.0 Ω/V at 400 V DC is under the 100 Ω/V needed')
  expect(await isolation.locator('[data-test="answer-result"]').innerText()).toContain('✕ Failed (measured)')
  expect(await page.locator('[data-test="item-bonding"] [data-test="answer-result"]').innerText()).toContain('✓ Passed')
  await page.close()

  // The run sheet: an official sees the start line, not a "Start the run" the route would refuse; a timekeeper has it.
  page = await as(event.cookie.official, `/events/${event.eventId}/run-sheet`, theme, width)
  const start = page.locator('[data-test="start-run"]')
  await start.waitFor()
  expect(await start.getByRole('button', { name: 'Start the run' }).count()).toBe(0)
  expect(await start.locator('[data-test="start-by-timekeeper"]').innerText()).toContain('A timekeeper starts the run')
  await page.close()
  page = await as(event.cookie.timekeeper, `/events/${event.eventId}/run-sheet`, theme, width)
  expect(await page.locator('[data-test="start-run"]').getByRole('button', { name: 'Start the run' }).count()).toBe(1)
  // The runs are listed by day on the event's clock (UTC here): today's under "Today", the older under their date.
  const day = (ms: number) => new Date(ms).toISOString().slice(0, 10)
  expect((await page.locator('[data-test="runs-day"]').allTextContents()).map(t => t.trim())).toEqual([`Today, ${day(Date.now())}`, day(twoDaysAgo)])
  await page.close()

  // A rider signing on in person on the organiser's device: the drawn mark is required, and the label says so.
  page = await as(event.cookie.organiser, `/events/${event.eventId}/briefings`, theme, width)
  const pads = page.locator('p.label', { hasText: 'Drawn signature' })
  await pads.first().waitFor()
  expect(await pads.allInnerTexts()).toContain('Drawn signature (required)')
  expect(await pads.allInnerTexts()).not.toContain('Drawn signature (optional)')
  await page.close()
})

it('reads an abort back before it is made, at 390 px at night; Cancel aborts nothing', async () => {
  const started = await call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { entryId: dated, direction: 'out' } })
  expect(started.status, JSON.stringify(started.body)).toBe(201)
  const page = await as(event.cookie.timekeeper, `/events/${event.eventId}/run-sheet`, 'dark', 390)
  await page.locator(`[data-test="run-${started.body.id}"]`).click()
  await page.fill('#abort-reason', 'rider waved off at the line')
  await page.press('#abort-reason', 'Enter')
  const readBack = page.locator('[data-test="abort-run"] [data-test="read-back-text"]')
  expect(await readBack.innerText()).toBe(`Abort run #${started.body.id} (Dated Sprite, out)? Reason: “rider waved off at the line”. `
    + 'An aborted run is never timed, and the abort is not undone.')
  const status = async () => (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper })).body
    .attempts.flatMap((a: { runs: { id: number, status: string }[] }) => a.runs).find((r: { id: number }) => r.id === started.body.id).status
  await page.locator('[data-test="abort-run"]').getByRole('button', { name: 'Cancel' }).click()
  expect(await status()).not.toBe('aborted')
  await page.press('#abort-reason', 'Enter')
  await page.locator('[data-test="abort-run"] [data-test="read-back-yes"]').click()
  await expect.poll(status).toBe('aborted')
  await page.close()
})
