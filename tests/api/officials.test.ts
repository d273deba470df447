import { beforeAll, expect, it } from 'vitest'
import { call, invitedPerson, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { makeReady } from '../support/ready-attempt'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// The permit and the officials appointed: the functions the profile requires (international motorcycle:
// clerk of the course, chief timekeeper, chief scrutineer, an observer; common practice, a setting of the
// profile) are a readiness item, and the dossier names the permit and the officials. Invented set-up.
let event: TestEvent
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const officials = async () => (await call('GET', `/api/events/${event.eventId}/officials`, { cookie: event.cookie.team })).body

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
})

it('records the permit and appoints people of the event; what the profile requires and nobody holds is said', async () => {
  const before = await officials()
  expect(before.required).toEqual(['clerk-of-course', 'chief-timekeeper', 'chief-scrutineer', 'observer'])
  expect(before.missing).toEqual(before.required)
  const appoint = (cookie: string, body: object) => call('POST', `/api/events/${event.eventId}/appointments`, { cookie, body })
  expect((await appoint(event.cookie.team, { function: 'steward', userId: await idOf(event.cookie.team) })).status).toBe(403)
  // Somebody with no role at this event (the demo's administrator) is not appointed.
  const outsider = await appoint(event.cookie.organiser, { function: 'steward', userId: 1 })
  expect(outsider.body.data.issues[0].path).toBe('userId')
  const clerk = await appoint(event.cookie.organiser, { function: 'clerk-of-course', userId: await idOf(event.cookie.official) })
  expect(clerk.status, JSON.stringify(clerk.body)).toBe(201)
  expect((await appoint(event.cookie.organiser, { function: 'clerk-of-course', userId: await idOf(event.cookie.official) })).status).toBe(409)
  expect((await officials()).missing).toEqual(['chief-timekeeper', 'chief-scrutineer', 'observer'])
  const permit = (body: object) => call('PUT', `/api/events/${event.eventId}/permit`, { cookie: event.cookie.organiser, body })
  const bad = await permit({ issuingBody: 'Test federation', number: 'P-1', validFrom: '2026-12-10', validTo: '2026-12-01' })
  expect(bad.body.data.issues).toEqual([{ path: 'validTo', message: 'must not be before the first day' }])
  expect((await permit({ issuingBody: 'Test federation', number: 'TF-P-9', validFrom: '2026-01-01', validTo: '2027-12-31' })).status).toBe(200)
})

it('holds the dossier back while a required function is vacant, and names the permit and officials in it', async () => {
  const entryId = await clearedEntry(event.eventId, 'Officious Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] } // 404.494 km/h
  const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', start, quick)
  const back = await kilometreRun(place, entryId, 'back', start + 120_000, quick)
  await makeReady(event, out.attemptId, [out.id, back.id], entryId)
  const item = async () => (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
    .items.find((i: { key: string }) => i.key === 'appointments')
  expect(await item()).toMatchObject({ met: true })
  const observer = (await officials()).appointments.find((a: { function: string }) => a.function === 'observer')
  const ended = await call('POST', `/api/appointments/${observer.id}/end`, { cookie: event.cookie.organiser, body: { reason: 'left the event' } })
  expect(ended.status).toBe(200)
  expect(await item()).toMatchObject({ met: false, detail: 'nobody holds: observer of the sanctioning body' })
  expect((await call('POST', `/api/attempts/${out.attemptId}/dossiers`, { cookie: event.cookie.team })).status).toBe(422)
  const again = await call('POST', `/api/events/${event.eventId}/appointments`, {
    cookie: event.cookie.organiser, body: { function: 'observer', userId: await idOf(event.cookie.official) },
  })
  expect(again.status).toBe(201)
  const issued = await call('POST', `/api/attempts/${out.attemptId}/dossiers`, { cookie: event.cookie.team })
  expect(issued.status, JSON.stringify(issued.body)).toBe(201)
  const bytes = new Uint8Array(await (await fetch(url(`/api/dossiers/${issued.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
  const text = (await pdfText(bytes, 'officials-dossier.pdf')).replace(/\s+/g, ' ')
  expect(text).toContain('Permit TF-P-9 of Test federation, valid 2026-01-01 to 2027-12-31.')
  expect(text).toContain('Clerk of the course: Test official')
  expect(text).toContain('Observer of the sanctioning body: Test official')
})

it('the timing sheet is the appointed chief timekeeper\'s, and the clearance the appointed chief scrutineer\'s', async () => {
  // Another timekeeper and another scrutineer of the event, neither appointed chief (the profile appoints both:
  // international motorcycle, common practice, a setting of the profile).
  const at = { eventId: event.eventId, organiser: event.cookie.organiser }
  const timekeeper2 = await invitedPerson('timekeeper', 'first-password-1', 'Second timekeeper', at)
  const scrutineer2 = await invitedPerson('scrutineer', 'first-password-1', 'Second scrutineer', at)
  const entryId = await clearedEntry(event.eventId, 'Deputy Sprite', {}, {
    team: event.cookie.team, scrutineer: scrutineer2.cookie, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: timekeeper2.cookie, traps: event.traps, systems: event.systems }
  const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] }
  const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', start, quick)
  await kilometreRun(place, entryId, 'back', start + 120_000, quick)
  const signed = await call('POST', `/api/attempts/${out.attemptId}/signatures`, { cookie: timekeeper2.cookie, body: { password: 'first-password-1', typedName: 'Second timekeeper' } })
  expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  const items = async () => (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body.items
  const sheet = (await items()).find((i: { key: string }) => i.key === 'timing-sheet')
  expect(sheet).toMatchObject({ met: false, detail: 'signed by Second timekeeper, who was not the appointed chief timekeeper: reopen it and have the chief timekeeper sign it' })
  const inspection = (await items()).find((i: { key: string }) => i.key === 'inspection')
  expect(inspection.met).toBe(false)
  expect(inspection.detail).toMatch(/^inspection #\d+ was signed by Second scrutineer, not the appointed chief scrutineer/)
  // The chief timekeeper reopens it and signs it: the sheet is theirs now.
  const sign = { password: 'first-password-1', typedName: 'Test timekeeper' }
  expect((await call('POST', `/api/attempts/${out.attemptId}/reopen`, { cookie: event.cookie.timekeeper, body: { ...sign, reason: 'the chief signs it' } })).status).toBe(201)
  expect((await call('POST', `/api/attempts/${out.attemptId}/signatures`, { cookie: event.cookie.timekeeper, body: sign })).status).toBe(201)
  expect((await items()).find((i: { key: string }) => i.key === 'timing-sheet')).toMatchObject({ met: true, detail: 'signed by Test timekeeper' })
})
