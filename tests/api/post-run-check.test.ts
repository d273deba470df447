import { beforeAll, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()
let event: TestEvent
const password = 'first-password-1' // the test event's people (tests/support/test-event.ts)

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
})

it('where the profile asks for it, readiness waits for the signed post-run check', async () => {
  // The organiser's adapted profile asks for the check (common practice: mass re-measured after a record).
  const adapted = await call('PUT', `/api/events/${event.eventId}/profile`, {
    cookie: event.cookie.organiser,
    body: { baseId: 'intl-motorcycle', postRunCheck: true, source: 'test rulebook, article 9' },
  })
  expect(adapted.status, JSON.stringify(adapted.body)).toBe(200)
  const entryId = await clearedEntry(event.eventId, 'Checked Runner', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: password })
  const place = { ...event, timekeeper: event.cookie.timekeeper }
  const out = await kilometreRun(place, entryId, 'out', minutesAgo(20), { primary: [0, 9], backup: [0, 9] })
  await kilometreRun(place, entryId, 'back', minutesAgo(10), { primary: [0, 9], backup: [0, 9] })
  const item = async () => (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
    .items.find((i: any) => i.key === 'post-run-check')
  expect(await item()).toMatchObject({ met: false, detail: 'not recorded' })
  const check = (who: string) => call('POST', `/api/attempts/${out.attemptId}/post-run-check`, {
    cookie: who, body: { massKg: 181.2, note: 'seals intact', typedName: 'Test scrutineer', password },
  })
  expect((await check(event.cookie.team)).status).toBe(403)
  const done = await check(event.cookie.scrutineer)
  expect(done.status, JSON.stringify(done.body)).toBe(201)
  expect((await check(event.cookie.scrutineer)).status).toBe(409)
  // The runs were typed in with starts before the inspection was signed: no inspection was in force at
  // them, so there is no inspected mass to compare with, and the inspection item is not met.
  expect(await item()).toMatchObject({ met: true, detail: '181.2 kg after the run, no inspected mass to compare; seals intact' })
  const inspection = (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
    .items.find((i: any) => i.key === 'inspection')
  expect(inspection.met).toBe(false)
  expect(inspection.detail).toContain(`run #${out.id}: no signed inspection before the run started`)
  const report = (await call('GET', `/api/signatures/${done.body.signatureId}`, { cookie: event.cookie.official })).body
  expect(report).toMatchObject({ kind: 'post-run-check', storedContentMatches: true, recordStillMatches: true })
})

it('compares the mass after the run with the mass of the inspection in force at the runs', async () => {
  const entryId = await clearedEntry(event.eventId, 'Weighed Runner', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: password })
  const place = { ...event, timekeeper: event.cookie.timekeeper }
  // Runs that start after the inspection was signed (a second from now, and ten minutes later).
  const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', start, { primary: [0, 9], backup: [0, 9] })
  await kilometreRun(place, entryId, 'back', start + 600_000, { primary: [0, 9], backup: [0, 9] })
  const readiness = async () => (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
  expect((await readiness()).items.find((i: any) => i.key === 'inspection')).toMatchObject({ met: true })
  const done = await call('POST', `/api/attempts/${out.attemptId}/post-run-check`, {
    cookie: event.cookie.scrutineer, body: { massKg: '180.9', note: 'ballast unchanged', typedName: 'Test scrutineer', password },
  })
  expect(done.status, JSON.stringify(done.body)).toBe(201)
  // Inspected at 181.5 kg (tests/support/entries.ts): 180.9 − 181.5 = −0.6 kg.
  expect((await readiness()).items.find((i: any) => i.key === 'post-run-check')).toMatchObject({
    met: true,
    detail: '180.9 kg after the run, inspected 181.5 kg, difference -0.6 kg; ballast unchanged',
  })
})
