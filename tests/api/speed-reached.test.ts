import { beforeAll, describe, expect, it } from 'vitest'
import { call, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { pdfText } from '../support/pdf-tools'
import { makeReady } from '../support/ready-attempt'
import { kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Safety by the speed reached (common practice: the grade, the tyres and the parachutes are judged on the speed the
// machine went, not only on the speed declared at inspection). The official speed over the flying kilometre is
// 3600 / t km/h for t seconds (1000 m); the test machine's tyres are rated 450 km/h and it carries one parachute
// (tests/support/entries.ts); parachutes: one over 175 mph, two over 300 mph = 482.8032 km/h (club rules, from memory;
// 1 mph = 1.609344 km/h, NIST SP 811). Invented set-up.
const codes = (r: { body: { data?: { findings?: { code: string }[] } } }) => r.body.data?.findings?.map(f => f.code)
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number
const start = (event: TestEvent, body: Record<string, unknown>) =>
  call('POST', `/api/events/${event.eventId}/runs`, { cookie: event.cookie.timekeeper, body: { direction: 'out', ...body } })
const both = (s: number) => ({ primary: [0, s] as [number, number], backup: [0, s] as [number, number] })
const place = (event: TestEvent) => ({ ...event, timekeeper: event.cookie.timekeeper })
const cleared = (event: TestEvent, name: string, rider: Parameters<typeof clearedEntry>[2] = {}) =>
  clearedEntry(event.eventId, name, rider, { team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1' })

describe('international profile: tyres and parachutes against the speed reached', () => {
  let event: TestEvent
  beforeAll(async () => {
    event = await newTestEvent('intl-motorcycle', 'UTC')
  })

  it('exactly the tyres\' rating lets the next run start; a thousandth of a second faster stops it until the clerk decides', async () => {
    const entryId = await cleared(event, 'Rated Sprite')
    // The runs leave after the inspection that cleared the machine was signed (its dossier asks for that).
    const t0 = Math.ceil(Date.now() / 1000) * 1000 + 1000
    // 8.000 s: 450.000 km/h, exactly the rating (within it, as "rated at least" reads at inspection).
    const out = await kilometreRun(place(event), entryId, 'out', t0, both(8))
    // 7.999 s: 3600 / 7.999 = 450.056 km/h, over it.
    const back = await kilometreRun(place(event), entryId, 'back', t0 + 120_000, both(7.999))
    const refused = await start(event, { entryId, startedAt: new Date(t0 + 240_000).toISOString() })
    expect(refused.status).toBe(409)
    expect(codes(refused)).toEqual(['reached.tyre-rating'])
    expect(refused.body.message).toContain(`run #${back.id} reached 450.056 km/h, over its tyres' rated 450 km/h`)
    // The run sheet names it for the entry before anyone presses Start.
    const sheet = (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper, now: new Date(t0 + 240_000) })).body
    expect(sheet.entries.find((e: { id: number }) => e.id === entryId).startLine.blocking.map((f: { code: string }) => f.code))
      .toEqual(['reached.tyre-rating'])

    // The sealed dossier of the pair says it, after the last run.
    await makeReady(event, out.attemptId, [out.id, back.id], entryId)
    const built = await call('POST', `/api/attempts/${out.attemptId}/dossiers`, { cookie: event.cookie.team })
    expect(built.status, JSON.stringify(built.body)).toBe(201)
    const pdf = new Uint8Array(await (await fetch(url(`/api/dossiers/${built.body.id}/pdf`), { headers: { cookie: event.cookie.team } })).arrayBuffer())
    expect((await pdfText(pdf, 'reached.pdf')).replace(/\s+/g, ' '))
      .toContain(`Speed reached: run #${back.id} reached 450.056 km/h, over its tyres' rated 450 km/h.`)

    // The clerk of the course (appointed by makeReady: the test official) lets it start, signed, with the reason.
    const override = await call('POST', `/api/entries/${entryId}/start-overrides`, {
      cookie: event.cookie.official,
      body: { codes: ['reached.tyre-rating'], reason: 'tyres replaced by a set rated 500 km/h, seen by the scrutineer', password: 'first-password-1', typedName: 'Test official' },
    })
    expect(override.status, JSON.stringify(override.body)).toBe(201)
    const run = await start(event, { entryId, startedAt: new Date(t0 + 300_000).toISOString() })
    expect(run.status, JSON.stringify(run.body)).toBe(201)
    expect(run.body.overrideId).toBe(override.body.id)
  })

  it('a speed over 300 mph asks for two parachutes where one is fitted', async () => {
    const entryId = await cleared(event, 'Chuted Sprite')
    // 7.45 s: 3600 / 7.45 = 483.221 km/h, over 482.8032 km/h (300 mph) and over the tyres' 450 km/h.
    const out = await kilometreRun(place(event), entryId, 'out', minutesAgo(30), both(7.45))
    const refused = await start(event, { entryId, direction: 'back', startedAt: new Date(minutesAgo(20)).toISOString() })
    expect(codes(refused)).toEqual(['reached.tyre-rating', 'reached.parachutes'])
    expect(refused.body.message).toContain(`run #${out.id} reached 483.221 km/h, at which 2 parachute(s) are needed; 1 fitted at inspection`)
  })
})

describe('club profile: the licence grade against the speed reached', () => {
  let event: TestEvent
  beforeAll(async () => {
    event = await newTestEvent('club-same-direction', 'UTC')
    const official = await idOf(event.cookie.official)
    const r = await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: 'clerk-of-course', userId: official } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  })

  it('a run over the rider\'s grade stops the next; one within it does not; an upgrade run is not held to the grade', async () => {
    // 200 mph = 321.8688 km/h (1 mph = 1.609344 km/h exactly, NIST SP 811). Declared 290 km/h at inspection.
    const within = await cleared(event, 'Graded Within', { licenceGrade: '200 mph' })
    // 11.2 s: 3600 / 11.2 = 321.428 km/h, within.
    await kilometreRun(place(event), within, 'out', minutesAgo(40), both(11.2))
    expect((await start(event, { entryId: within, startedAt: new Date(minutesAgo(35)).toISOString() })).status).toBe(201)

    const over = await cleared(event, 'Graded Over', { licenceGrade: '200 mph' })
    // 11.18 s: 3600 / 11.18 = 322.003 km/h, over 321.8688.
    const fast = await kilometreRun(place(event), over, 'out', minutesAgo(40), both(11.18))
    const refused = await start(event, { entryId: over, startedAt: new Date(minutesAgo(30)).toISOString() })
    expect(codes(refused)).toEqual(['reached.licence-grade'])
    expect(refused.body.message).toContain(`run #${fast.id} reached 322.003 km/h, over the 321.8688 km/h of licence grade 200 mph`)

    // An upgrade run to 250 mph that goes over 200 mph is what it was for: the next start is not held to the old grade.
    const upgrading = await cleared(event, 'Graded Upgrade', { licenceGrade: '200 mph' })
    const up = await call('POST', `/api/events/${event.eventId}/runs`, {
      cookie: event.cookie.timekeeper,
      body: { entryId: upgrading, direction: 'out', expectedKmh: 330, licenceUpgrade: true, startedAt: new Date(minutesAgo(40)).toISOString() },
    })
    expect(up.status, JSON.stringify(up.body)).toBe(201)
    for (const system of ['primary', 'backup'] as const) {
      for (const [trap, s] of [['K-in', 0], ['K-out', 11.18]] as const) {
        const time = new Date(minutesAgo(40) + 60_000 + s * 1000).toISOString().slice(11, 23)
        const r = await call('POST', `/api/runs/${up.body.id}/readings`, { cookie: event.cookie.timekeeper, body: { trapId: event.traps[trap], systemId: event.systems[system], time } })
        expect(r.status, JSON.stringify(r.body)).toBe(201)
      }
    }
    const next = await start(event, { entryId: upgrading, startedAt: new Date(minutesAgo(30)).toISOString() })
    expect(codes(next) ?? []).not.toContain('reached.licence-grade')
  })
})
