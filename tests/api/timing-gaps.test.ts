import { beforeAll, describe, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { eventClockTime } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Two independent timing systems time every run; a time one of them lacks is a finding until the appointed chief
// timekeeper writes why (common practice). Here the backup missed the exit trap on the out run: the primary's time
// counts, and the gap blocks the dossier until accounted for. Invented set-up.
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const sign = (name: string) => ({ password: 'first-password-1', typedName: name })

let event: TestEvent
let runId = 0
let attemptId = 0
const item = async () => (await call('GET', `/api/attempts/${attemptId}/readiness`, { cookie: event.cookie.team })).body
  .items.find((i: { key: string }) => i.key === `finding-timing.single-system-${runId}`)

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'Europe/Paris')
  const entryId = await clearedEntry(event.eventId, 'Gap machine', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
  const run = await call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { entryId, direction: 'out', startedAt: new Date(t0).toISOString() } })
  expect(run.status, JSON.stringify(run.body)).toBe(201)
  runId = run.body.id
  attemptId = run.body.attemptId
  const read = async (trap: 'K-in' | 'K-out', system: 'primary' | 'backup', s: number) => {
    const r = await call('POST', `/api/runs/${runId}/readings`, { cookie: event.cookie.timekeeper, body: { trapId: event.traps[trap], systemId: event.systems[system], time: eventClockTime(t0 + 60_000 + s * 1000, event.timeZone) } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  }
  await read('K-in', 'primary', 0)
  await read('K-out', 'primary', 8.9)
  await read('K-in', 'backup', 0)
}, 60_000)

describe('a run timed by one system only', () => {
  it('is a failing finding naming the system that has no time, on the run and in readiness', async () => {
    const live = (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })).body
      .find((a: { id: number }) => a.id === attemptId)
    const run = live.runs.find((r: { id: number }) => r.id === runId)
    expect(run.findings.find((f: { code: string }) => f.code === 'timing.single-system')).toMatchObject({ severity: 'fail' })
    expect(run.findings.find((f: { code: string }) => f.code === 'timing.single-system').message).toMatch(/^Flying kilometre: timed by the primary system \(.+\) only; the backup system \(.+\) has no time over it\. The chief timekeeper must write why\.$/)
    // The primary's 8.9 s counts: 1000 m / 8.9 s × 3.6 = 404.494 km/h (truncated).
    expect(run.official.kmh).toBe('404.494')
  })

  it('is not a steward\'s to set aside, and only the appointed chief timekeeper writes why', async () => {
    const body = { code: 'timing.single-system', runId, reason: 'The backup\'s exit beam was knocked out of line by a gust; the primary saw the pass.' }
    const steward = await idOf(event.cookie.official)
    expect((await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: 'steward', userId: steward } })).status).toBe(201)
    const byStewards = await call('POST', `/api/attempts/${attemptId}/set-asides`, { cookie: event.cookie.official, body: { ...body, ...sign('Test official') } })
    expect(byStewards.status).toBe(403)
    expect(byStewards.body.statusMessage).toBe('Only the chief timekeeper appointed at this event writes why a run was timed by one system only')
    expect((await item()).detail).toBe('blocks the dossier until it is resolved, or the appointed chief timekeeper sets it aside with a signed, written reason')
    expect((await item()).finding).toMatchObject({ setAsideable: true, authority: 'chief-timekeeper' })
    expect((await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: 'chief-timekeeper', userId: await idOf(event.cookie.timekeeper) } })).status).toBe(201)
    const byChief = await call('POST', `/api/attempts/${attemptId}/set-asides`, { cookie: event.cookie.timekeeper, body: { ...body, ...sign('Test timekeeper') } })
    expect(byChief.status, JSON.stringify(byChief.body)).toBe(201)
    expect(byChief.body).toMatchObject({ signers: 1, quorum: 1 })
    expect(await item()).toMatchObject({ met: true, detail: `set aside by the chief timekeeper (Test timekeeper): ${body.reason}` })
  })
})
