import { expect } from 'vitest'
import { call, invitedPerson, url } from './api'
import { clearedEntry } from './entries'
import { form, pdf } from './files'
import { kilometreRun } from './runs'
import type { TestEvent } from './test-event'

/**
 * A pair of the test event's own team, ready for its dossier: an entry cleared by the event's scrutineer, out and
 * back over the flying kilometre in `seconds` on both systems (starting a second from now, two minutes apart), then
 * everything readiness asks for (makeReady). 8.9 s over 1000 m is 404.494 km/h, over the test record of 400.000.
 */
export async function readyPair(event: TestEvent, machineName: string, seconds = 8.9) {
  const entryId = await clearedEntry(event.eventId, machineName, {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
  const both = { primary: [0, seconds] as [number, number], backup: [0, seconds] as [number, number] }
  // The runs leave after the inspection that cleared the machine was signed.
  const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const out = await kilometreRun(place, entryId, 'out', t0, both)
  const back = await kilometreRun(place, entryId, 'back', t0 + 120_000, both)
  const { second } = await makeReady(event, out.attemptId, [out.id, back.id], entryId)
  return { entryId, attemptId: out.attemptId, runIds: [out.id, back.id], second }
}

/**
 * Brings an attempt of a test event (its two runs in) to a dossier: the course survey, both calibration
 * certificates, the rider's licence, weather at each run, the timing sheet signed, two officials'
 * statements and (unless `confirm: false`) the stewards' confirmation of the result. The files are invented
 * PDFs; only what readiness asks for, nothing of the figures.
 */
export async function makeReady(
  event: TestEvent,
  attemptId: number,
  runIds: number[],
  entryId: number,
  options: { uploadBase?: string, confirm?: boolean } = {},
) {
  // The files go through the server named (another app server, in the test of several), else the tests' own.
  const at = (path: string) => (options.uploadBase ? `${options.uploadBase}${path}` : url(path))
  const upload = async (who: string, fields: Record<string, string | number>, name: string) => {
    const r = await fetch(at(`/api/events/${event.eventId}/evidence`), {
      method: 'POST', headers: { cookie: who }, body: form(fields, { name, bytes: pdf(name) }),
    })
    expect(r.status, await r.clone().text()).toBe(201)
  }
  const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.organiser })).body
  await upload(event.cookie.organiser, { kind: 'survey-certificate', courseId: setup.courses[0].id }, 'survey.pdf')
  for (const role of ['primary', 'backup'] as const) {
    await upload(event.cookie.timekeeper, { kind: 'calibration-certificate', timingSystemId: event.systems[role] }, `${role}.pdf`)
  }
  await upload(event.cookie.team, { kind: 'rider-licence', entryId }, 'licence.pdf')
  for (const runId of runIds) {
    const w = await call('POST', `/api/runs/${runId}/weather`, { cookie: event.cookie.timekeeper, body: { windSpeedMs: '1.0', windFromDeg: '0' } })
    expect(w.status).toBe(201)
  }
  const signed = await call('POST', `/api/attempts/${attemptId}/signatures`, {
    cookie: event.cookie.timekeeper, body: { password: 'first-password-1', typedName: 'Test timekeeper' },
  })
  expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  const second = await invitedPerson('official', 'first-password-1', 'Second official', { eventId: event.eventId, organiser: event.cookie.organiser })
  // The functions the profile requires, held by the test event's people (the clerk of the course and the
  // observer by its officials); a function already held stays so.
  const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
  const appointees: [string, string][] = [['clerk-of-course', event.cookie.official], ['chief-timekeeper', event.cookie.timekeeper],
    ['chief-scrutineer', event.cookie.scrutineer], ['observer', second.cookie]]
  for (const [fn, cookie] of appointees) {
    const r = await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: fn, userId: await idOf(cookie) } })
    expect([201, 409], JSON.stringify(r.body)).toContain(r.status)
  }
  for (const [cookie, name] of [[event.cookie.official, 'Test official'], [second.cookie, 'Second official']] as const) {
    const s = await call('POST', `/api/events/${event.eventId}/statements`, {
      cookie,
      body: { attemptId, runsSeen: 'both', position: 'timing hut', conditions: 'calm', password: 'first-password-1', typedName: name },
    })
    expect(s.status, JSON.stringify(s.body)).toBe(201)
  }
  if (options.confirm !== false) await confirmByStewards(event, attemptId, [[event.cookie.official, 'Test official'], [second.cookie, 'Second official']])
  /** The second official, appointed observer of the sanctioning body here unless someone already was. */
  return { second }
}

/** The first instant the stewards may confirm the attempt's result, as its readiness says (the periods' end + 1 ms). */
export async function confirmableAt(cookie: string, attemptId: number) {
  const r = await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie })
  expect(r.body.confirmation?.after, JSON.stringify(r.body)).toBeTruthy()
  return new Date(Date.parse(r.body.confirmation.after) + 1)
}

/**
 * The stewards' confirmation of the attempt's result: these officials appointed stewards (where not yet) and each
 * signing it, judged (the test server's clock) at the first instant after the protest and appeal periods.
 */
export async function confirmByStewards(event: TestEvent, attemptId: number, stewards: (readonly [string, string])[]) {
  const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
  const now = await confirmableAt(event.cookie.organiser, attemptId)
  for (const [cookie, name] of stewards) {
    const a = await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: 'steward', userId: await idOf(cookie) } })
    expect([201, 409], JSON.stringify(a.body)).toContain(a.status)
    const c = await call('POST', `/api/attempts/${attemptId}/confirmations`, { cookie, now, body: { password: 'first-password-1', typedName: name } })
    expect(c.status, JSON.stringify(c.body)).toBe(201)
  }
}
