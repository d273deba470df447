import { beforeAll, describe, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

let event: TestEvent
let entryId: number
const place = () => ({ eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems })
// The kilometre in 9 s on both systems (400 km/h): times for the test only.
const nine = { primary: [0, 9] as [number, number], backup: [0, 9] as [number, number] }

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  entryId = await clearedEntry(event.eventId, 'Placement Sprite', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
})

const sheet = async () => (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper })).body

describe('where a run goes', () => {
  it('tells the timekeeper before the start, and pairs an out and a back run inside the window', async () => {
    const before = (await sheet()).entries.find((e: { id: number }) => e.id === entryId)
    expect(before.cleared).toBe(true)
    expect(before.next.out.message).toBe('This run starts a new attempt.')
    const out = await kilometreRun(place(), entryId, 'out', minutesAgo(30), nine)
    const next = (await sheet()).entries.find((e: { id: number }) => e.id === entryId).next
    // International motorcycle rules: opposite directions, 2 h from the first start (FIM world records page, seen).
    expect(next.back).toMatchObject({ joins: out.attemptId })
    expect(next.out.joins).toBeNull()
    expect(next.out.message).toContain(`Attempt #${out.attemptId} has its out run already; its second run must go back.`)
    // A second out run is never paired with the first: it opens a new attempt, and the answer says why.
    const again = await call('POST', `/api/events/${event.eventId}/runs`, {
      cookie: event.cookie.timekeeper, body: { entryId, direction: 'out', startedAt: new Date(minutesAgo(20)).toISOString() },
    })
    expect(again.status).toBe(201)
    expect(again.body.attemptId).not.toBe(out.attemptId)
    expect(again.body.placement).toContain('This run starts a new attempt.')
  })

  it('never pairs a return run that starts after the window closed', async () => {
    const far = await clearedEntry(event.eventId, 'Far Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    // Out 3 h ago; back now: 2 h window from the start of the first run (FIM page, seen) long closed.
    const out = await kilometreRun(place(), far, 'out', minutesAgo(180), nine)
    const back = await kilometreRun(place(), far, 'back', minutesAgo(1), nine)
    expect(back.attemptId).not.toBe(out.attemptId)
  })
})

describe('a signature names its signer', () => {
  it('refuses a typed name that is not the name on file unless the signer says why; case and spacing aside', async () => {
    const r = await kilometreRun(place(), entryId, 'back', minutesAgo(10), nine)
    const sign = (body: Record<string, unknown>) => call('POST', `/api/attempts/${r.attemptId}/signatures`, {
      cookie: event.cookie.timekeeper, body: { password: 'first-password-1', ...body },
    })
    const wrong = await sign({ typedName: 'Somebody Else' })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.issues[0].path).toBe('typedName')
    expect(wrong.body.data.issues[0].message).toContain('is not the name on your account (Test timekeeper)')
    const spaced = await sign({ typedName: '  test   TIMEKEEPER ' })
    expect(spaced.status, JSON.stringify(spaced.body)).toBe(201)
  })

  it('takes a different name with the signer\'s reason, and keeps the reason', async () => {
    const far = await clearedEntry(event.eventId, 'Noted Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    const run = await kilometreRun(place(), far, 'out', minutesAgo(5), nine)
    const signed = await call('POST', `/api/attempts/${run.attemptId}/signatures`, {
      cookie: event.cookie.timekeeper,
      body: { password: 'first-password-1', typedName: 'T. Keeper-Smith', nameNote: 'my name as on my licence' },
    })
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    const shown = await call('GET', `/api/signatures/${signed.body.id}`, { cookie: event.cookie.timekeeper })
    expect(shown.status).toBe(200)
  })
})

describe('the organiser corrects the set-up', () => {
  const setup = async () => (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.organiser })).body

  it('corrects a trap nothing signed rests on, keeping the values before and the reason', async () => {
    const extra = await call('POST', `/api/events/${event.eventId}/traps`, {
      cookie: event.cookie.organiser, body: { courseId: (await setup()).courses[0].id, label: 'X-1', positionM: '500', elevationM: '1000' },
    })
    expect(extra.status).toBe(201)
    const url = `/api/events/${event.eventId}/setup/traps/${extra.body.id}`
    const noReason = await call('PATCH', url, { cookie: event.cookie.organiser, body: { ...extra.body, positionM: '510' } })
    expect(noReason.status).toBe(422)
    expect(noReason.body.data.issues[0].path).toBe('reason')
    const fixed = await call('PATCH', url, {
      cookie: event.cookie.organiser, body: { ...extra.body, positionM: '510', reason: 'survey sheet misread' },
    })
    expect(fixed.status, JSON.stringify(fixed.body)).toBe(200)
    expect(fixed.body.positionM).toBe('510.000')
    const after = await setup()
    const change = after.history.find((h: { subjectId: number }) => h.subjectId === extra.body.id)
    expect(change).toMatchObject({ subject: 'trap', action: 'edit', reason: 'survey sheet misread', by: 'Test Organiser' })
    expect(change.before.positionM).toBe('500.000')
    expect(change.after.positionM).toBe('510.000')
    // A team reads the set-up and cannot correct it.
    expect((await call('PATCH', url, { cookie: event.cookie.team, body: { ...extra.body, reason: 'mine' } })).status).toBe(403)
    // Retired, it leaves the set-up; its history stays, and its label is free again.
    const retired = await call('POST', `${url}/retire`, { cookie: event.cookie.organiser, body: { reason: 'not on the course' } })
    expect(retired.status, JSON.stringify(retired.body)).toBe(200)
    const gone = await setup()
    expect(gone.courses[0].traps.some((t: { id: number }) => t.id === extra.body.id)).toBe(false)
    expect(gone.history.filter((h: { subjectId: number, subject: string }) => h.subject === 'trap' && h.subjectId === extra.body.id)).toHaveLength(2)
  })

  it('locks a trap and a timing system a signed timing sheet rests on, saying why; refuses to retire one in use', async () => {
    const url = `/api/events/${event.eventId}/setup/traps/${event.traps['K-in']}`
    const s = await setup()
    const trap = s.courses[0].traps.find((t: { id: number }) => t.id === event.traps['K-in'])
    expect(s.locks[`traps:${trap.id}`]).toMatch(/^Locked: the signed timing sheets? of attempts? #\d+/)
    const refused = await call('PATCH', url, { cookie: event.cookie.organiser, body: { ...trap, positionM: '2001', reason: 'moved' } })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('Reopen the sheet with a reason')
    const system = await call('POST', `/api/events/${event.eventId}/setup/timing-systems/${event.systems.primary}/retire`, {
      cookie: event.cookie.organiser, body: { reason: 'broken' },
    })
    expect(system.status).toBe(409)
  })

  it('refuses a calibration that expires before it was done, naming the field', async () => {
    const s = await setup()
    const backup = s.systems.find((x: { role: string }) => x.role === 'backup')
    const r = await call('PATCH', `/api/events/${event.eventId}/setup/timing-systems/${backup.id}`, {
      cookie: event.cookie.organiser,
      body: { ...backup, calibratedOn: '2026-06-01', calibrationExpires: '2026-05-01', reason: 'certificate dates' },
    })
    expect(r.status).toBe(422)
    expect(r.body.data.issues).toEqual([{ path: 'calibrationExpires', message: 'must be after the calibration date' }])
  })
})

describe('a team corrects its entry', () => {
  const details = (licenceNo: string, reason = '') => ({
    rider: { name: 'Test Rider', licenceNo, licenceExpires: '2099-12-31' },
    machine: { name: 'Edited Sprite', power: 'electric', declaredMassKg: '181.5', division: 'partial' },
    reason,
  })
  const changes = async (cookie: string) => (await call('GET', `/api/events/${event.eventId}/entry-changes`, { cookie })).body

  it('corrects it at once before its first run, and through the organiser after it', async () => {
    const fresh = await clearedEntry(event.eventId, 'Unrun Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    const before = await call('PATCH', `/api/entries/${fresh}`, { cookie: event.cookie.team, body: details('LIC-2') })
    expect(before.status, JSON.stringify(before.body)).toBe(200)
    expect(before.body.status).toBe('applied')
    const mine = (await changes(event.cookie.team)).entries.find((e: { id: number }) => e.id === fresh)
    expect(mine).toMatchObject({ hasRun: false, rider: { licenceNo: 'LIC-2' }, machine: { name: 'Edited Sprite', declaredMassKg: '181.5' } })

    // The entry that has run: without a reason the request is refused, naming the field; with one it waits.
    const bare = await call('PATCH', `/api/entries/${entryId}`, { cookie: event.cookie.team, body: details('LIC-3') })
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0].path).toBe('reason')
    const asked = await call('PATCH', `/api/entries/${entryId}`, { cookie: event.cookie.team, body: details('LIC-3', 'licence renewed') })
    expect(asked.body.status).toBe('requested')
    const unchanged = (await changes(event.cookie.team)).entries.find((e: { id: number }) => e.id === entryId)
    expect(unchanged.rider.licenceNo).toBe('DEMO-T-1')
    // Another role cannot decide it; the organiser approves it and the entry changes, with its history.
    const url = `/api/change-requests/${asked.body.requestId}/decision`
    expect((await call('POST', url, { cookie: event.cookie.team, body: { approve: true } })).status).toBe(403)
    const approved = await call('POST', url, { cookie: event.cookie.organiser, body: { approve: true, note: 'seen the new card' } })
    expect(approved.status, JSON.stringify(approved.body)).toBe(200)
    expect(approved.body.status).toBe('approved')
    const after = await changes(event.cookie.organiser)
    expect(after.entries.find((e: { id: number }) => e.id === entryId).rider.licenceNo).toBe('LIC-3')
    const history = after.history.find((h: { subjectId: number }) => h.subjectId === entryId)
    expect(history.reason).toBe('licence renewed (approved: seen the new card)')
    expect(history.before.rider.licenceNo).toBe('DEMO-T-1')
    expect((await call('POST', url, { cookie: event.cookie.organiser, body: { approve: false } })).status).toBe(409)
  })

  it('a fresh entry sharing the rider and machine of one that has run changes them only through the organiser, with history on both', async () => {
    const ran = (await changes(event.cookie.team)).entries.find((e: { id: number }) => e.id === entryId)
    const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.team })).body
    const distanceId = setup.distances.find((d: { label: string }) => d.label === 'Flying kilometre').id
    const shared = await call('POST', `/api/events/${event.eventId}/entries`, {
      cookie: event.cookie.team,
      body: { machineId: ran.machineId, riderId: ran.riderId, className: 'Electric, partially streamlined', distanceId },
    })
    expect(shared.status, JSON.stringify(shared.body)).toBe(201)
    // The fresh entry has not run, but the rows it names have: the change waits, and nothing changes meanwhile.
    const bare = await call('PATCH', `/api/entries/${shared.body.id}`, { cookie: event.cookie.team, body: details('LIC-9') })
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0].path).toBe('reason')
    const asked = await call('PATCH', `/api/entries/${shared.body.id}`, { cookie: event.cookie.team, body: details('LIC-9', 'new licence card') })
    expect(asked.body).toMatchObject({ status: 'requested' })
    const mid = await changes(event.cookie.team)
    expect(mid.entries.find((e: { id: number }) => e.id === entryId).rider.licenceNo).toBe('LIC-3')
    const approved = await call('POST', `/api/change-requests/${asked.body.requestId}/decision`, { cookie: event.cookie.organiser, body: { approve: true } })
    expect(approved.status, JSON.stringify(approved.body)).toBe(200)
    const after = await changes(event.cookie.organiser)
    expect(after.entries.find((e: { id: number }) => e.id === entryId).rider.licenceNo).toBe('LIC-9')
    const onRan = after.history.find((h: { subjectId: number, after: any }) => h.subjectId === entryId && h.after.rider.licenceNo === 'LIC-9')
    expect(onRan.reason).toBe(`new licence card (approved) (made through entry #${shared.body.id}, which shares it)`)
    expect(onRan.before.rider.licenceNo).toBe('LIC-3')
    expect(after.history.some((h: { subjectId: number, after: any }) => h.subjectId === shared.body.id && h.after.rider.licenceNo === 'LIC-9')).toBe(true)
  })
})
