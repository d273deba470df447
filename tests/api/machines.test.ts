import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { answerAll, clearedEntry, FIGURES } from '../support/entries'
import { kilometreRun } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
let event: TestEvent
const password = 'first-password-1' // the test event's people (tests/support/test-event.ts)

beforeAll(async () => {
  await db.connect()
  event = await newTestEvent('intl-motorcycle', 'UTC')
})
afterAll(() => db.end())

const startRun = (entryId: number) => call('POST', `/api/events/${event.eventId}/runs`, {
  cookie: event.cookie.timekeeper, body: { entryId, direction: 'out' },
})
const abort = (runId: number) => call('POST', `/api/runs/${runId}/abort`, { cookie: event.cookie.timekeeper, body: { reason: 'a test start' } })

describe('machines, not entries', { shuffle: false }, () => {
  let first = 0
  let second = 0
  let machineId = 0

  it('one inspection clears the machine for every entry it makes', async () => {
    first = await clearedEntry(event.eventId, 'Twin Entry', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: password })
    const [row] = (await db.query('select machine_id, rider_id, distance_id from entries where id = $1', [first])).rows
    machineId = row.machine_id
    // The same machine and rider entered again, in another class: no second inspection.
    const entry = await call('POST', `/api/events/${event.eventId}/entries`, {
      cookie: event.cookie.team,
      body: { machineId, riderId: row.rider_id, className: 'Electric, fully streamlined', distanceId: row.distance_id },
    })
    expect(entry.status, JSON.stringify(entry.body)).toBe(201)
    second = entry.body.id
    const list = (await call('GET', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer })).body as any[]
    expect(list.filter(e => [first, second].includes(e.id)).map(e => e.cleared)).toEqual([true, true])
    const run = await startRun(second)
    expect(run.status).toBe(201)
    expect((await abort(run.body.id)).status).toBe(200)
  })

  it('a suspension, signed, stops every entry of the machine until a new inspection clears it', async () => {
    const refused = await call('POST', `/api/machines/${machineId}/suspensions`, {
      cookie: event.cookie.team, body: { reason: 'crashed at the exit trap', typedName: 'Test team', password },
    })
    expect(refused.status).toBe(403)
    const suspended = await call('POST', `/api/machines/${machineId}/suspensions`, {
      cookie: event.cookie.scrutineer, body: { reason: 'low-side slide past the exit trap; fairing and HV loom to check', typedName: 'Test scrutineer', password },
    })
    expect(suspended.status, JSON.stringify(suspended.body)).toBe(201)
    for (const entryId of [first, second]) {
      const r = await startRun(entryId)
      expect(r.status).toBe(409)
      expect(r.body.statusMessage).toContain('suspended')
    }
    const report = (await call('GET', `/api/signatures/${suspended.body.signatureId}`, { cookie: event.cookie.official })).body
    expect(report).toMatchObject({ kind: 'suspension', storedContentMatches: true, recordStillMatches: true })
    // The re-inspection, signed after the suspension, clears the machine for both entries again.
    const started = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId: second, baseId: 'electric-motorcycle' } })
    expect(started.status).toBe(201)
    await call('PATCH', `/api/inspections/${started.body.id}`, { cookie: event.cookie.scrutineer, body: FIGURES })
    await answerAll(started.body.id, undefined, { scrutineer: event.cookie.scrutineer })
    const signed = await call('POST', `/api/inspections/${started.body.id}/signatures`, { cookie: event.cookie.scrutineer, body: { password, typedName: 'Test scrutineer' } })
    expect(signed.status).toBe(201)
    const run = await startRun(first)
    expect(run.status).toBe(201)
  })

  it('readiness names the inspection in force at the start of each run, not merely the latest', async () => {
    const entryId = await clearedEntry(event.eventId, 'Twice Inspected', {}, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: password })
    const place = { ...event, timekeeper: event.cookie.timekeeper }
    const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
    const out = await kilometreRun(place, entryId, 'out', start, { primary: [0, 9], backup: [0, 9] })
    // Re-inspected between the runs (after a modification, say), once the out run has started: the back
    // run runs under the new one.
    await new Promise(resolve => setTimeout(resolve, Math.max(0, start + 500 - Date.now())))
    const again = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
    expect(again.status).toBe(201)
    await call('PATCH', `/api/inspections/${again.body.id}`, { cookie: event.cookie.scrutineer, body: FIGURES })
    await answerAll(again.body.id, undefined, { scrutineer: event.cookie.scrutineer })
    expect((await call('POST', `/api/inspections/${again.body.id}/signatures`, { cookie: event.cookie.scrutineer, body: { password, typedName: 'Test scrutineer' } })).status).toBe(201)
    await kilometreRun(place, entryId, 'back', start + 600_000, { primary: [0, 9], backup: [0, 9] })
    const first = again.body.previousId
    const item = (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
      .items.find((i: any) => i.key === 'inspection')
    expect(item).toMatchObject({
      met: true,
      detail: `inspection #${first}, #${again.body.id} in force and clearing the machine at each counted run`,
    })
    // The machine against its class: electric, partially streamlined (FIM extract: streamlining divisions).
    const klass = (await call('GET', `/api/attempts/${out.attemptId}/readiness`, { cookie: event.cookie.team })).body
      .items.find((i: any) => i.key === 'class')
    expect(klass).toMatchObject({ met: true, label: 'The machine fits its class (Electric, partially streamlined)' })
  })
})
