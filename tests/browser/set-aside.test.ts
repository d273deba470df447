import { afterAll, beforeAll, expect, it } from 'vitest'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, demoEventPath, login, useTestServer } from '../support/api'
import { launchBrowser, signIn } from '../support/browser'
import { clearedEntry } from '../support/entries'
import { eventClockTime, kilometreRun, minutesAgo } from '../support/runs'

await useTestServer()
let hut: Awaited<ReturnType<typeof launchBrowser>>
let stand: Awaited<ReturnType<typeof launchBrowser>>
beforeAll(async () => {
  [hut, stand] = await Promise.all([launchBrowser(), launchBrowser()])
})
afterAll(async () => {
  await hut?.close()
  await stand?.close()
})

it('a run started by the server clock, a failing cross-check that blocks the dossier, and the stewards\' release', async () => {
  // A cleared entry of the test's own, whose back run (the systems agreeing) is already in, twenty minutes ago.
  const organiser = await login(demoEmail('organiser'))
  const eventId = await demoEventId(organiser)
  const setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: organiser })).body
  const timeZone = setup.event.timeZone as string
  const north = setup.courses.find((c: any) => c.name === 'North course')
  const trap = (label: string) => north.traps.find((t: any) => t.label === label).id
  const system = (role: string) => setup.systems.find((s: any) => s.role === role).id
  const entryId = await clearedEntry(eventId, 'Cinder Beam')
  const place = {
    eventId, timeZone, timekeeper: await login(demoEmail('timekeeper')),
    traps: { 'K-in': trap('K-in'), 'K-out': trap('K-out') }, systems: { primary: system('primary'), backup: system('backup') },
  }
  const back = await kilometreRun(place, entryId, 'back', minutesAgo(20), { primary: [0, 9], backup: [0, 9] })

  // The timekeeper starts the out run on the run sheet: the server's clock, the event's zone named.
  const tk = await signIn(hut, demoEmail('timekeeper'), await demoEventPath('/run-sheet'))
  const option = tk.locator('#sr-entry option', { hasText: 'Cinder Beam' })
  await tk.selectOption('#sr-entry', (await option.getAttribute('value'))!)
  await tk.selectOption('#sr-direction', 'out')
  expect(await tk.locator('#sr-now').isChecked()).toBe(true)
  await tk.uncheck('#sr-now')
  expect(await tk.locator('label[for="sr-start"]').innerText()).toContain(timeZone)
  await tk.check('#sr-now')
  const started = tk.waitForResponse(r => r.url().endsWith('/runs') && r.request().method() === 'POST')
  const before = Date.now()
  await tk.click('button:has-text("Start the run")')
  const run = await (await started).json() as { id: number, attemptId: number, startedAt: string }
  expect(run.attemptId).toBe(back.attemptId)
  expect(Date.parse(run.startedAt)).toBeGreaterThanOrEqual(before - 1000)
  expect(Date.parse(run.startedAt)).toBeLessThanOrEqual(Date.now() + 1000)
  await tk.locator(`h2:has-text("Run #${run.id} ")`).waitFor()

  // The kilometre in 9.0000 s on the primary and 9.050 s on the backup: 0.05 s apart, over the stated
  // tolerances of the two systems added (0.002 s + 0.002 s; common practice, reasoned).
  const entryAt = Math.ceil(Date.now() / 1000) * 1000 + 5000
  const typed: [string, string, string][] = [
    ['K-in', 'primary', eventClockTime(entryAt, timeZone)],
    ['K-out', 'primary', eventClockTime(entryAt + 9000, timeZone)],
    ['K-in', 'backup', eventClockTime(entryAt, timeZone).slice(0, -1)],
    ['K-out', 'backup', eventClockTime(entryAt + 9050, timeZone).slice(0, -1)],
  ]
  for (const [label, role, time] of typed) {
    await tk.locator(`[data-test="cell-${label}-${role}"]`).focus()
    await tk.keyboard.type(time)
    await tk.keyboard.press('Enter')
    await tk.locator(`[data-test="value-${label}-${role}"]`).waitFor()
  }

  // A steward finds the failing cross-check blocking the dossier and proposes setting it aside in writing; the
  // second steward reads the same words and signs: the profile's panel decides by two signatures.
  const official = await signIn(stand, 'official2@trapline.test', `/attempts/${run.attemptId}/dossier`)
  const item = official.locator(`[data-test="ready-finding-timing.cross-check-${run.id}"]`)
  await expect.poll(() => item.innerText()).toMatch(/to do/i)
  expect(await item.innerText()).toContain('blocks the dossier until it is resolved, or 2 appointed stewards set it aside')
  const form = item.locator(`[data-test="set-aside-timing.cross-check-${run.id}"]`)
  const reason = 'Backup beam knocked by a gust at the exit trap; primary confirmed against the photo finish.'
  await form.locator('textarea').fill(reason)
  await form.locator('input:not([type="password"])').fill('Orla Ormsby')
  await form.locator('input[type="password"]').fill(DEMO_PASSWORD)
  await form.locator('button:has-text("Propose and sign the set-aside")').click()
  await expect.poll(() => item.innerText()).toContain('signed by Orla Ormsby; it takes effect once 2 stewards have signed (1 more)')
  expect(await item.innerText()).toMatch(/to do/i)

  const second = await signIn(hut, 'official3@trapline.test', `/attempts/${run.attemptId}/dossier`)
  const pending = second.locator(`[data-test="ready-finding-timing.cross-check-${run.id}"]`)
  const cosign = pending.locator(`[data-test="set-aside-timing.cross-check-${run.id}"]`)
  expect(await cosign.innerText()).toContain(reason)
  expect(await cosign.locator('textarea').count()).toBe(0)
  await cosign.locator('input:not([type="password"])').fill('Stellan Vey')
  await cosign.locator('input[type="password"]').fill(DEMO_PASSWORD)
  await cosign.locator('button:has-text("Sign the decision")').click()
  await expect.poll(() => pending.innerText()).toMatch(/done/i)
  expect(await pending.innerText()).toContain(`set aside by the stewards (Orla Ormsby and Stellan Vey): ${reason}`)

  // The team's live results now read the pair as valid, with the decision beside the finding.
  const team2 = await login('team2@trapline.test')
  const live = (await call('GET', `/api/events/${eventId}/live`, { cookie: team2 })).body.find((a: any) => a.id === run.attemptId)
  expect(live.valid).toBe(true)
  expect(live.runs.find((r: any) => r.id === run.id).findings.find((f: any) => f.code === 'timing.cross-check').setAside.reason).toBe(reason)
})
