import { beforeAll, describe, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
import { clearedEntry, DRAWN } from '../support/entries'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// The start line: a run starts only for a rider whose licence is valid on the day, graded for the expected speed
// where the profile grades licences (club practice, from memory), with a valid medical where the profile requires
// one (international practice, common practice), signed on to the latest briefing; the clerk of the course alone
// lets a run start over these, with a signed reason. Invented set-up.
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const start = (event: TestEvent, body: Record<string, unknown>) =>
  call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { direction: 'out', ...body } })
const codes = (r: { body: { data?: { findings?: { code: string }[] } } }) => r.body.data?.findings?.map(f => f.code)
const cleared = (event: TestEvent, name: string, rider: Parameters<typeof clearedEntry>[2] = {}) =>
  clearedEntry(event.eventId, name, rider, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })

describe('international profile: licence and medical', () => {
  let event: TestEvent
  beforeAll(async () => {
    event = await newTestEvent('intl-motorcycle', 'UTC')
  })

  it('stops a rider with no medical, and lets the clerk of the course alone override it, signed', async () => {
    const entryId = await cleared(event, 'Medical Sprite', { medicalExpires: null })
    const refused = await start(event, { entryId })
    expect(refused.status).toBe(409)
    expect(codes(refused)).toEqual(['licence.medical'])
    expect(refused.body.message).toContain('no medical recorded for Test Rider; the profile requires one')
    // The run sheet names it for the entry before anyone presses Start.
    const sheet = (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.official })).body
    expect(sheet.entries.find((e: { id: number }) => e.id === entryId).startLine.blocking.map((f: { code: string }) => f.code))
      .toEqual(['licence.medical'])
    expect(sheet.clerk).toBe(false)
    const override = (cookie: string, body: Record<string, unknown>) => call('POST', `/api/entries/${entryId}/start-overrides`, {
      cookie, body: { codes: ['licence.medical'], password: 'first-password-1', typedName: 'Test official', ...body },
    })
    // Not the clerk of the course (yet): refused; a timekeeper never.
    expect((await override(event.cookie.official, { reason: 'medical seen on paper' })).status).toBe(403)
    expect((await override(event.cookie.timekeeper, { reason: 'medical seen on paper' })).status).toBe(403)
    const appointed = await call('POST', `/api/events/${event.eventId}/appointments`, {
      cookie: event.cookie.organiser, body: { function: 'clerk-of-course', userId: await idOf(event.cookie.official) },
    })
    expect(appointed.status).toBe(201)
    const noReason = await override(event.cookie.official, { reason: '' })
    expect(noReason.body.data.issues).toEqual([{ path: 'reason', message: 'say why the run may start' }])
    const wrongPassword = await override(event.cookie.official, { reason: 'medical seen on paper', password: 'nope' })
    expect(wrongPassword.body.data.issues[0].path).toBe('password')
    const signed = await override(event.cookie.official, { reason: 'medical certificate seen on paper, upload to follow' })
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    expect(signed.body.signatureId).toBeGreaterThan(0)
    const run = await start(event, { entryId })
    expect(run.status, JSON.stringify(run.body)).toBe(201)
    expect(run.body.overrideId).toBe(signed.body.id)
    // The declared speed at inspection (290 km/h, the test figures) is kept as the run's expected speed.
    expect(Number(run.body.expectedKmh)).toBe(290)
    // Timed, the run stays without a medical in the file: the override let it start, it does not make it count.
    const at = (s: number) => new Date(Date.parse(run.body.startedAt) + 60_000 + s * 1000).toISOString().slice(11, 23)
    for (const system of ['primary', 'backup'] as const) {
      for (const [trap, s] of [['K-in', 0], ['K-out', 8.9]] as const) {
        const r = await call('POST', `/api/runs/${run.body.id}/readings`, { cookie: event.cookie.timekeeper, body: { trapId: event.traps[trap], systemId: event.systems[system], time: at(s) } })
        expect(r.status, JSON.stringify(r.body)).toBe(201)
      }
    }
    const attempt = (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })).body
      .find((a: { id: number }) => a.id === run.body.attemptId)
    expect(attempt.findings.find((f: { code: string }) => f.code === 'rider.medical')).toMatchObject({ severity: 'fail',
      message: expect.stringMatching(/^No medical is recorded for the rider, which the profile requires, for the run\(s\) of \d{4}-\d\d-\d\d\.$/) })
  })

  it('stops a rider whose licence expired, naming the date', async () => {
    const entryId = await cleared(event, 'Expired Sprite', { licenceExpires: '2020-01-01' })
    const refused = await start(event, { entryId })
    expect(refused.status).toBe(409)
    expect(codes(refused)).toEqual(['licence.expired'])
    expect(refused.body.message).toContain('Test Rider\'s licence DEMO-T-1 expired on 2020-01-01')
    // An override covers only the findings it names: one for the medical does not let this through.
    const other = await call('POST', `/api/entries/${entryId}/start-overrides`, {
      cookie: event.cookie.official,
      body: { codes: ['licence.medical'], reason: 'wrong finding', password: 'first-password-1', typedName: 'Test official' },
    })
    expect(other.status).toBe(201)
    expect(codes(await start(event, { entryId }))).toEqual(['licence.expired'])
  })
})

describe('the riders\' briefing', () => {
  let event: TestEvent
  let entryId: number
  let briefingId: number
  beforeAll(async () => {
    event = await newTestEvent('intl-motorcycle', 'UTC')
    entryId = await cleared(event, 'Briefed Sprite')
    const held = await call('POST', `/api/events/${event.eventId}/briefings`, {
      cookie: event.cookie.organiser,
      body: { title: 'Riders\' briefing', heldAt: new Date(Date.now() - 3_600_000).toISOString(), notes: 'Course, signals' },
    })
    expect(held.status, JSON.stringify(held.body)).toBe(201)
    briefingId = held.body.id
  })

  it('stops a rider who did not sign on to the latest briefing', async () => {
    const refused = await start(event, { entryId })
    expect(refused.status).toBe(409)
    expect(codes(refused)).toEqual(['briefing.missed'])
    const list = (await call('GET', `/api/events/${event.eventId}/briefings`, { cookie: event.cookie.team })).body
    expect(list.briefings[0].missing.map((r: { name: string }) => r.name)).toEqual(['Test Rider'])
  })

  it('takes a sign-on on the team\'s phone with the rider\'s own name, or in person with a drawn mark', async () => {
    const riders = (await call('GET', `/api/events/${event.eventId}/briefings`, { cookie: event.cookie.team })).body.riders
    const riderId = riders.find((r: { entryIds: number[] }) => r.entryIds.includes(entryId)).id
    const signOn = (cookie: string, body: Record<string, unknown>) =>
      call('POST', `/api/briefings/${briefingId}/sign-ons`, { cookie, body })
    const wrongName = await signOn(event.cookie.team, { riderId, typedName: 'Test team', password: 'first-password-1' })
    expect(wrongName.body.data.issues[0]).toMatchObject({ path: 'typedName' })
    expect(wrongName.body.data.issues[0].message).toContain('is not the name on file (Test Rider)')
    // In person needs the organiser's device and the rider's drawn mark.
    expect((await signOn(event.cookie.team, { riderId, onDevice: 'organiser', typedName: 'Test Rider', drawingPng: DRAWN })).status).toBe(403)
    const undrawn = await signOn(event.cookie.organiser, { riderId, onDevice: 'organiser', typedName: 'Test Rider' })
    expect(undrawn.body.data.issues[0].path).toBe('drawingPng')
    const own = await signOn(event.cookie.team, { riderId, typedName: 'test  rider', password: 'first-password-1' })
    expect(own.status, JSON.stringify(own.body)).toBe(201)
    expect(own.body).toMatchObject({ riderId, onDevice: 'own', name: 'Test Rider' })
    expect((await signOn(event.cookie.organiser, { riderId, onDevice: 'organiser', typedName: 'Test Rider', drawingPng: DRAWN })).status).toBe(409)
    // A crew member signs on as themselves.
    const crew = await signOn(event.cookie.scrutineer, { typedName: 'Test scrutineer', password: 'first-password-1' })
    expect(crew.status).toBe(201)
    const run = await start(event, { entryId })
    expect(run.status, JSON.stringify(run.body)).toBe(201)
    expect(run.body.overrideId).toBeNull()
  })

  it('asks again once a later briefing is held', async () => {
    const later = await call('POST', `/api/events/${event.eventId}/briefings`, {
      cookie: event.cookie.official,
      body: { title: 'Second briefing: wind', heldAt: new Date(Date.now() - 60_000).toISOString() },
    })
    expect(later.status).toBe(201)
    const refused = await start(event, { entryId, direction: 'back' })
    expect(codes(refused)).toEqual(['briefing.missed'])
    expect(refused.body.message).toContain('did not sign on to the Second briefing: wind')
  })
})

describe('club profile: licences graded by speed', () => {
  let event: TestEvent
  beforeAll(async () => {
    event = await newTestEvent('club-same-direction', 'UTC')
  })

  it('stops a run faster than the grade; an upgrade run goes one grade up and is recorded as such', async () => {
    // 150 mph = 241.4016 km/h; the machine is declared at 290 km/h at inspection.
    const entryId = await cleared(event, 'Graded Sprite', { licenceGrade: '150 mph' })
    const fast = await start(event, { entryId })
    expect(codes(fast)).toEqual(['licence.grade'])
    expect(fast.body.message).toContain('grade 150 mph allows up to 241.4016 km/h; this run expects 290 km/h')
    // 290 km/h is past 175 mph (281.6352 km/h): too far for an upgrade run.
    expect(codes(await start(event, { entryId, licenceUpgrade: true }))).toEqual(['licence.upgrade-too-far'])
    const upgrade = await start(event, { entryId, expectedKmh: 270, licenceUpgrade: true })
    expect(upgrade.status, JSON.stringify(upgrade.body)).toBe(201)
    expect(upgrade.body).toMatchObject({ licenceUpgrade: '175 mph', expectedKmh: '270' })
  })

  it('stops a rider with no grade, and refuses an upgrade at the top grade', async () => {
    const none = await cleared(event, 'Ungraded Sprite', { licenceGrade: null })
    expect(codes(await start(event, { entryId: none }))).toEqual(['licence.no-grade'])
    const top = await cleared(event, 'Unlimited Sprite', { licenceGrade: 'unlimited' })
    const r = await start(event, { entryId: top, licenceUpgrade: true })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('licenceUpgrade')
    expect((await start(event, { entryId: top })).status).toBe(201)
  })
})
