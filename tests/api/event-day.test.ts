import pg from 'pg'
import { addDays } from '#shared/rules/zoned'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, login, url, useTestServer } from '../support/api'
import { pairSpeed, speedOver, timesOver } from '../support/hand'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
await db.connect()
afterAll(() => db.end())

let eventId = 0
const cookie = {} as Record<'organiser' | 'timekeeper' | 'team' | 'team2' | 'official', string>
let setup: any
const trapId = (label: string) => setup.courses.find((c: { name: string }) => c.name === 'North course').traps.find((t: { label: string }) => t.label === label).id
const system = (role: string) => setup.systems.find((s: { role: string }) => s.role === role)

beforeAll(async () => {
  for (const who of ['organiser', 'timekeeper', 'official'] as const) cookie[who] = await login(demoEmail(who))
  cookie.team = await login('team@trapline.test')
  cookie.team2 = await login('team2@trapline.test')
  eventId = await demoEventId(cookie.organiser)
  setup = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body
  // The second team's rider's licence ran out on the demo's run day: the start line stops the Wisp today until
  // the clerk of the course (the demo's official) lets it run, signed, for the day.
  const wisp = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
  const override = await call('POST', `/api/entries/${wisp}/start-overrides`, {
    cookie: cookie.official,
    body: { codes: ['licence.expired'], reason: 'renewal seen on paper', password: DEMO_PASSWORD, typedName: 'Oswin Oakes' },
  })
  expect(override.status, JSON.stringify(override.body)).toBe(201)
})

/** Starts a run for an entry and enters the four traps on one system, given as times of day. */
async function runWith(entryId: number, direction: 'out' | 'back', times: Record<string, string>, role = 'primary') {
  const run = await call('POST', `/api/events/${eventId}/runs`, { cookie: cookie.timekeeper, body: { entryId, direction, startedAt: new Date().toISOString() } })
  expect(run.status).toBe(201)
  for (const [label, time] of Object.entries(times)) {
    const r = await call('POST', `/api/runs/${run.body.id}/readings`, { cookie: cookie.timekeeper, body: { trapId: trapId(label), systemId: system(role).id, time } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  }
  return run.body as { id: number, attemptId: number }
}

const live = async () => (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.team })).body as any[]

describe('the demo attempt', () => {
  it('computes the demo pair from its stored trap times as a hand computation does', async () => {
    const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.timekeeper })).body
    const attempt = sheet.attempts.find((a: any) => a.entry.machineName === 'Larkspur Fennwick streamliner' && a.runs.length === 2)
    const elapsed = timesOver(attempt.runs, trapId('M-in'), trapId('M-out'), system('primary').id)
    expect(attempt.runs.map((r: any) => r.official.kmh)).toEqual(elapsed.map((t: any) => speedOver('1609.344', t).kmh))
    const byHand = pairSpeed('1609.344', elapsed[0], elapsed[1])
    expect(attempt.result).toMatchObject(byHand)
    // Out and back, within the window, the systems agreeing: valid; compared in mph with the demo's invented
    // record, published as 239.227 mph.
    expect(attempt.valid).toBe(true)
    expect(attempt.standingRecord).toEqual({ speed: '239.227', unit: 'mph', minimum: false })
    expect(attempt.beatsRecord).toBe(Number(byHand.mph) > 239.227)
    // Both timing systems agree within their stated tolerance on every run.
    expect(attempt.runs.every((r: any) => r.crossChecks.length === 2 && r.crossChecks.every((c: any) => c.ok))).toBe(true)
    // Wind resolved against the heading: 2.4 m/s from 200° on heading 172° is a head-wind of 2.4·cos 28° = 2.119 m/s.
    expect(attempt.runs[0].wind.headMs).toBeCloseTo(2.4 * Math.cos((28 * Math.PI) / 180), 9)
  })

  it('a first run alone shows the return-run target and the window deadline', async () => {
    const attempt = (await live()).find(a => a.runs.filter((r: any) => r.counted).length === 1 && a.standingRecord && a.runs[0].official)
    expect(attempt.returnTargetS).toMatch(/^\d+\.\d{4}$/)
    const first = attempt.runs.find((r: any) => r.counted)
    expect(attempt.window.deadline).toBe(new Date(Date.parse(first.startedAt) + 120 * 60_000).toISOString())
  })
})

describe('polling the live results', () => {
  it('answers 304 to an unchanged poll and 200 with a new ETag after a new reading', async () => {
    const first = await fetch(url(`/api/events/${eventId}/live`), { headers: { cookie: cookie.team } })
    const etag = first.headers.get('etag')!
    expect(first.status).toBe(200)
    expect(Date.parse(first.headers.get('date')!)).toBeGreaterThan(0)
    const again = await fetch(url(`/api/events/${eventId}/live`), { headers: { 'cookie': cookie.team, 'if-none-match': etag } })
    expect(again.status).toBe(304)
    const entryId = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
    await runWith(entryId, 'out', { 'M-in': '16:00:00.0000' })
    const changed = await fetch(url(`/api/events/${eventId}/live`), { headers: { 'cookie': cookie.team, 'if-none-match': etag } })
    expect(changed.status).toBe(200)
    expect(changed.headers.get('etag')).not.toBe(etag)
  })
})

describe('the run sheet', () => {
  it('appends corrections, keeps the history, and refuses a second correction of the same value', async () => {
    const entryId = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
    const run = await runWith(entryId, 'back', { 'K-out': '11:00:00.0000', 'K-in': '11:00:10.7000' })
    const dup = await call('POST', `/api/runs/${run.id}/readings`, { cookie: cookie.timekeeper, body: { trapId: trapId('K-out'), systemId: system('primary').id, time: '11:00:00.0001' } })
    expect(dup.status).toBe(409)
    const sheet = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.timekeeper })).body
    const reading = sheet.history.find((h: any) => h.runId === run.id && h.trapId === trapId('K-in'))
    const body = { time: '11:00:10.7123', reason: 'misread the printout', expectedCurrentId: reading.id }
    const first = await call('POST', `/api/readings/${reading.id}/corrections`, { cookie: cookie.timekeeper, body })
    expect(first.status).toBe(201)
    const second = await call('POST', `/api/readings/${reading.id}/corrections`, { cookie: cookie.timekeeper, body: { ...body, time: '11:00:10.7999' } })
    expect(second.status).toBe(409)
    expect(second.body.data.current.id).toBe(String(first.body.id)) // the value that is current now
    const after = (await call('GET', `/api/events/${eventId}/run-sheet`, { cookie: cookie.timekeeper })).body
    const cell = after.history.filter((h: any) => h.runId === run.id && h.trapId === trapId('K-in'))
    expect(cell.map((h: any) => [h.ticks, h.current, h.reason])).toEqual([['396107000', false, null], ['396107123', true, 'misread the printout']])
    // 1000 m in 10.7123 s = 336.063… km/h (3.6 × 1000 / 10.7123), truncated.
    const lr = after.attempts.flatMap((a: any) => a.runs).find((r: any) => r.id === run.id)
    expect(lr.official).toMatchObject({ timeS: '10.7123', kmh: '336.062' })
    // Readings are append-only in PostgreSQL itself.
    await expect(db.query('update readings set ticks = 1 where id = $1', [reading.id])).rejects.toThrow(/append-only/)
    await expect(db.query('delete from readings where id = $1', [reading.id])).rejects.toThrow(/append-only/)
  })

  it('flags times out of order and implausible speeds beside the reading', async () => {
    const entryId = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
    const run = await runWith(entryId, 'out', { 'M-in': '12:00:00.0000', 'K-in': '11:59:59.0000', 'K-out': '12:00:01.0000' })
    const lr = (await live()).flatMap(a => a.runs).find(r => r.id === run.id)
    const codes = lr.findings.map((f: any) => `${f.code}@${f.trapId}`)
    expect(codes).toContain(`reading.out-of-order@${trapId('K-in')}`)
    // 1000 m in 2 s is 1800 km/h: beyond any land speed record.
    expect(codes).toContain(`reading.implausible-speed@${trapId('K-out')}`)
  })

  it('refuses a reading for a trap of another course with 422 naming the field', async () => {
    const course = await call('POST', `/api/events/${eventId}/courses`, { cookie: cookie.organiser, body: { name: 'South course', headingDeg: '10', surface: 'clay', surveyToleranceMm: 10 } })
    expect(course.status).toBe(201)
    const trap = await call('POST', `/api/events/${eventId}/traps`, { cookie: cookie.organiser, body: { courseId: course.body.id, label: 'S1', positionM: '100', elevationM: '1180' } })
    expect(trap.status).toBe(201)
    const southTraps = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body.courses.find((c: any) => c.id === course.body.id).traps
    expect(southTraps.map((t: any) => [t.id, t.label])).toEqual([[trap.body.id, 'S1']])
    const runId = (await live()).find(a => a.entry.machineName === 'Larkspur Fennwick streamliner').runs[0].id
    const r = await call('POST', `/api/runs/${runId}/readings`, { cookie: cookie.timekeeper, body: { trapId: trap.body.id, systemId: system('primary').id, time: '10:00:00.0000' } })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('trapId')
  })

  it('refuses a measured distance that does not match the survey', async () => {
    const r = await call('POST', `/api/events/${eventId}/distances`, {
      cookie: cookie.organiser,
      body: { courseId: setup.courses.find((c: any) => c.name === 'North course').id, label: 'Bad mile', start: 'flying', nominalM: '1609.000', entryTrapId: trapId('M-in'), exitTrapId: trapId('M-out') },
    })
    expect(r.status).toBe(422)
    expect(r.body.data.issues[0].path).toBe('nominalM')
    expect(r.body.data.issues[0].message).toMatch(/344.0 mm longer than the nominal/)
    // The demo mile is surveyed exactly; its gradient is (1187.339 − 1187.412) / 1609.344 = −0.0045 %.
    expect(setup.distances.find((d: any) => d.label === 'Flying mile').check).toMatchObject({ differenceMm: '0', gradientPercent: '-0.0045', withinTolerance: true })
  })
})

describe('signing the timing sheet', () => {
  it('locks the readings, keeps every signature, and can be reopened with a reason', async () => {
    const entryId = setup.entries.find((e: any) => e.machineName === 'Larkspur Fennwick streamliner').id
    const run = await runWith(entryId, 'out', { 'M-in': '13:00:00.0000', 'M-out': '13:00:14.6000' })
    const wrong = await call('POST', `/api/attempts/${run.attemptId}/signatures`, { cookie: cookie.timekeeper, body: { password: 'not-it', typedName: 'Tobias Tick' } })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.issues[0].path).toBe('password')
    const signed = await call('POST', `/api/attempts/${run.attemptId}/signatures`, { cookie: cookie.timekeeper, body: { password: DEMO_PASSWORD, typedName: 'Tobias Tick' } })
    expect(signed.status).toBe(201)
    expect(signed.body.sha256).toMatch(/^[0-9a-f]{64}$/)

    const late = await call('POST', `/api/runs/${run.id}/readings`, { cookie: cookie.timekeeper, body: { trapId: trapId('K-in'), systemId: system('primary').id, time: '13:00:02.0000' } })
    expect(late.status).toBe(409)
    const again = await call('POST', `/api/attempts/${run.attemptId}/signatures`, { cookie: cookie.timekeeper, body: { password: DEMO_PASSWORD, typedName: 'Tobias Tick' } })
    expect(again.status).toBe(409)
    await expect(db.query(`update signatures set typed_name = 'X' where id = $1`, [signed.body.id])).rejects.toThrow(/append-only/)

    const reopened = await call('POST', `/api/attempts/${run.attemptId}/reopen`, { cookie: cookie.timekeeper, body: { password: DEMO_PASSWORD, typedName: 'Tobias Tick', reason: 'kilometre traps were left out' } })
    expect(reopened.status).toBe(201)
    expect((await call('POST', `/api/runs/${run.id}/readings`, { cookie: cookie.timekeeper, body: { trapId: trapId('K-in'), systemId: system('primary').id, time: '13:00:02.0000' } })).status).toBe(201)
    const resigned = await call('POST', `/api/attempts/${run.attemptId}/signatures`, { cookie: cookie.timekeeper, body: { password: DEMO_PASSWORD, typedName: 'Tobias Tick' } })
    expect(resigned.status).toBe(201)

    const sheet = await call('GET', `/api/attempts/${run.attemptId}/timing-sheet`, { cookie: cookie.official })
    expect(sheet.body.signatures.map((s: any) => [s.kind, s.storedContentMatches, s.matchesCurrent])).toEqual([
      ['timing-sheet', true, false], ['timing-sheet-reopened', true, false], ['timing-sheet', true, true],
    ])
    expect(sheet.body.sha256).toBe(resigned.body.sha256)
  })
})

describe('CSV import', () => {
  let runId = 0
  let freshRunId = 0
  const count = async () => Number((await db.query('select count(*) from readings')).rows[0].count)
  beforeAll(async () => {
    const entryId = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
    runId = (await runWith(entryId, 'out', {})).id
    freshRunId = (await runWith(entryId, 'back', {})).id
  })
  const send = (csv: string, commit = false, columns = { run: 'run', trap: 'trap', time: 'time' }) =>
    call('POST', `/api/events/${eventId}/imports`, { cookie: cookie.timekeeper, body: { csv, columns, systemId: system('backup').id, commit } })

  it('previews a valid file, then writes every row', async () => {
    const csv = `run,trap,time\n${runId},M-in,14:00:00.000\n${runId},K-in,14:00:03.250\n${runId},K-out,14:00:13.960\n${runId},M-out,14:00:17.210\n`
    const before = await count()
    const preview = await send(csv)
    expect(preview.status).toBe(200)
    expect(preview.body).toMatchObject({ ok: true, written: 0 })
    expect(preview.body.rows).toHaveLength(4)
    expect(await count()).toBe(before)
    const written = await send(csv, true)
    expect(written.body.written).toBe(4)
    expect(await count()).toBe(before + 4)
  })

  it.each([
    ['the wrong delimiter', (id: number) => `run;trap;time\n${id};M-in;14:00:00.000`, { line: 1, column: 'run', message: /delimiter/ }],
    ['a missing column', (id: number) => `run,trap\n${id},M-in`, { line: 1, column: 'time', message: /missing/ }],
    ['an unknown run', (id: number) => `run,trap,time\n${id},M-in,15:00:00.000\n999999,K-in,15:00:03.000`, { line: 3, column: 'run', message: /no run "999999"/ }],
    ['an impossible time', (id: number) => `run,trap,time\n${id},M-in,15:00:00.000\n${id},K-in,25:61:00.000`, { line: 3, column: 'time', message: /out of range/ }],
  ])('refuses a file with %s, naming line and column, and writes nothing', async (_what, make, expected) => {
    const before = await count()
    const r = await send(make(freshRunId), true)
    expect(r.status).toBe(422)
    expect(r.body.written).toBe(0)
    expect(r.body.errors[0]).toMatchObject({ line: expected.line, column: expected.column })
    expect(r.body.errors[0].message).toMatch(expected.message)
    expect(await count()).toBe(before)
  })
})

describe('entries', () => {
  it('a team enters a new machine and rider; another team\'s machine is refused', async () => {
    const distanceId = setup.distances.find((d: any) => d.label === 'Flying mile').id
    const ok = await call('POST', `/api/events/${eventId}/entries`, {
      cookie: cookie.team2,
      body: { machine: { name: 'Cinder Wisp Two', power: 'electric', declaredMassKg: '199.5', division: 'none' }, rider: { name: 'Jory Vantreese', licenceNo: 'DEMO-L-0983', licenceExpires: '2099-08-12' }, className: 'Electric, unstreamlined', distanceId },
    })
    expect(ok.status).toBe(201)
    const other = await call('POST', `/api/events/${eventId}/entries`, { cookie: cookie.team, body: { machineId: ok.body.machineId, riderId: ok.body.riderId, className: 'x', distanceId } })
    expect(other.status).toBe(422)
    expect(other.body.data.issues[0].path).toBe('machineId')
  })

  it('an entry names one of the profile\'s classes, stored as the profile spells it', async () => {
    // The international motorcycle profile lists its classes (electric by streamlining division: FIM extract).
    const distanceId = setup.distances.find((d: any) => d.label === 'Flying mile').id
    const body = (className: string) => ({ machine: { name: `Cinder Class ${className.length}`, power: 'electric', declaredMassKg: '150.0', division: 'none' }, rider: { name: 'Jory Vantreese', licenceNo: 'DEMO-L-0984', licenceExpires: '2099-08-12' }, className, distanceId })
    const typed = await call('POST', `/api/events/${eventId}/entries`, { cookie: cookie.team2, body: body('  electric,  UNSTREAMLINED ') })
    expect(typed.status, JSON.stringify(typed.body)).toBe(201)
    expect(typed.body.className).toBe('Electric, unstreamlined')
    const unknown = await call('POST', `/api/events/${eventId}/entries`, { cookie: cookie.team2, body: body('Electric, open') })
    expect(unknown.status).toBe(422)
    expect(unknown.body.data.issues[0]).toMatchObject({ path: 'className' })
    expect(unknown.body.data.issues[0].message).toContain('choose one of the event\'s')
  })
})

describe('event details', () => {
  it('the organiser changes the venue; a last day before the first is refused naming the field', async () => {
    const { venue, startsOn } = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body.event
    try {
      const ok = await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { venue: 'Tamsel Flat dry lake (fictional), north shore' } })
      expect(ok.status).toBe(200)
      expect(ok.body.venue).toBe('Tamsel Flat dry lake (fictional), north shore')
      const bad = await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { endsOn: addDays(startsOn, -1) } })
      expect(bad.status).toBe(422)
      expect(bad.body.data.issues[0].path).toBe('endsOn')
    }
    finally {
      // The demo event is shared by every test: its venue goes back as it was.
      await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { venue } })
    }
  })
})

describe('what was signed stays as signed', () => {
  const streamliner = async () => (await live()).find(a => a.entry.machineName === 'Larkspur Fennwick streamliner' && a.sheet.locked)

  it('refuses to abort a run of a signed sheet, or add weather to it, naming the signature (409)', async () => {
    const attempt = await streamliner()
    const signatureId = attempt.sheet.latest.id
    const runId = attempt.runs[0].id
    const aborted = await call('POST', `/api/runs/${runId}/abort`, { cookie: cookie.timekeeper, body: { reason: 'a late second thought' } })
    expect(aborted.status).toBe(409)
    expect(aborted.body.statusMessage).toContain(`signature #${signatureId}`)
    const weather = await call('POST', `/api/runs/${runId}/weather`, { cookie: cookie.timekeeper, body: { windSpeedMs: '9.00', windFromDeg: '10.00' } })
    expect(weather.status).toBe(409)
    const after = (await live()).find(a => a.id === attempt.id)
    expect(after.runs.map((r: any) => [r.status, r.weather?.windSpeedMs])).toEqual(attempt.runs.map((r: any) => [r.status, r.weather?.windSpeedMs]))
  })

  it('refuses to rename the event or change its time zone while a sheet is signed; the venue may change', async () => {
    const { name, timeZone, venue } = (await call('GET', `/api/events/${eventId}/setup`, { cookie: cookie.organiser })).body.event
    const renamed = await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { name: `${name} (renamed)` } })
    expect(renamed.status).toBe(409)
    expect(renamed.body.statusMessage).toContain('signed timing sheets')
    expect((await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { timeZone: 'UTC' } })).status).toBe(timeZone === 'UTC' ? 200 : 409)
    try {
      expect((await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { venue: `${venue}, west shore` } })).status).toBe(200)
    }
    finally {
      await call('PATCH', `/api/events/${eventId}`, { cookie: cookie.organiser, body: { venue } })
    }
  })

  it('finds a sheet changed behind the app since it was signed, and readiness refuses the dossier', async () => {
    const attempt = await streamliner()
    const ready = async () => (await call('GET', `/api/attempts/${attempt.id}/readiness`, { cookie: cookie.team })).body
    expect((await ready()).items.find((i: any) => i.key === 'timing-sheet').met).toBe(true)
    const [{ name }] = (await db.query('select name from events where id = $1', [eventId])).rows
    try {
      // Straight in the database, past the app's refusal: the name is part of the signed content.
      await db.query('update events set name = $1 where id = $2', [`${name} (altered)`, eventId])
      const item = (await ready()).items.find((i: any) => i.key === 'timing-sheet')
      expect(item.met).toBe(false)
      expect(item.detail).toContain('differs from what was signed')
      expect((await ready()).ready).toBe(false)
      // (Its claims are decided, and decided is final: no new dossier of it is built whatever readiness says.)
      expect((await call('POST', `/api/attempts/${attempt.id}/dossiers`, { cookie: cookie.team })).status).toBe(409)
    }
    finally {
      await db.query('update events set name = $1 where id = $2', [name, eventId])
    }
  })
})

describe('starting a run', () => {
  it('takes the server\'s clock when no start is given', async () => {
    const entryId = setup.entries.find((e: any) => e.machineName === 'Cinder Wisp').id
    const before = Date.now()
    const run = await call('POST', `/api/events/${eventId}/runs`, { cookie: cookie.timekeeper, body: { entryId, direction: 'back' } })
    const after = Date.now()
    expect(run.status).toBe(201)
    const at = Date.parse(run.body.startedAt)
    expect(at).toBeGreaterThanOrEqual(before - 1000)
    expect(at).toBeLessThanOrEqual(after + 1000)
    // Aborted again, so that the second team's attempt keeps its one counted run for the other tests.
    expect((await call('POST', `/api/runs/${run.body.id}/abort`, { cookie: cookie.timekeeper, body: { reason: 'started by the clock test' } })).status).toBe(200)
  })
})
