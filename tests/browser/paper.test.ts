import { afterAll, beforeAll, expect, it } from 'vitest'
import { call, demoEventId, login } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'
import { pdfText } from '../support/pdf-tools'

// Print-ready pages, rendered as the browser prints them (Chromium's print to PDF, print media): the figures
// are on paper, the page's controls are not. Demo data; the figures themselves are checked in tests/api/paper.
let desk: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  desk = await launchBrowser()
})
afterAll(async () => {
  await desk?.close()
})

it('prints a time slip and the day\'s start list without the page\'s controls', async () => {
  const cookie = await login('timekeeper@trapline.test')
  const eventId = await demoEventId(cookie)
  const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie })).body
  const run = sheet.attempts.find((a: any) => a.entry.machineName === 'Larkspur Fennwick streamliner' && a.sheet.locked).runs[0]
  const slip = (await call('GET', `/api/runs/${run.id}/time-slip`, { cookie })).body
  const page = await signIn(desk, 'timekeeper@trapline.test', `/runs/${run.id}/time-slip`)
  await page.locator('[data-test="time-slip"]').waitFor()
  const printed = await pdfText(await page.pdf({ format: 'A4' }), 'time-slip-printed.pdf')
  expect(printed).toContain(`Time slip · run #${run.id}`)
  expect(printed).toContain(slip.distances[0].kmh)
  expect(printed).toContain(sheet.timeZone)
  expect(printed).not.toContain('Record book') // the site's menu
  expect(printed).not.toMatch(/\bPrint\b/)

  await page.goto(`${desk.baseUrl}/events/${eventId}/paper?sheet=start-list&date=${slip.run.startedAt.slice(0, 10)}`)
  await page.locator('[data-test="paper-run-order"]').waitFor()
  const list = await pdfText(await page.pdf({ format: 'A4' }), 'start-list-printed.pdf')
  expect(list).toContain('Start list and run order')
  expect(list).toContain(`#${run.id}`)
  expect(list).not.toContain('Day as CSV')
})
