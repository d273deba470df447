import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { allItems } from '#shared/inspection/evaluate'
import { electricMotorcycle } from '#shared/inspection/templates'
import { call, DEMO_PASSWORD, demoEmail, demoEventId, invitedPerson, login, useTestServer } from '../support/api'
import { answerAll, FIGURES, newEntry } from '../support/entries'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
await db.connect()
afterAll(() => db.end())

const cookie = {} as Record<'organiser' | 'scrutineer' | 'timekeeper' | 'team' | 'team2' | 'official', string>
let eventId = 0
let entryId = 0

beforeAll(async () => {
  for (const who of ['organiser', 'scrutineer', 'timekeeper', 'official'] as const) cookie[who] = await login(demoEmail(who))
  cookie.team = await login('team@trapline.test')
  cookie.team2 = await login('team2@trapline.test')
  eventId = await demoEventId(cookie.organiser)
  entryId = await newEntry(eventId, 'Cinder Brandle')
})

const answer = (id: number, body: Record<string, unknown>) => call('POST', `/api/inspections/${id}/answers`, { cookie: cookie.scrutineer, body })
const startRun = () => call('POST', `/api/events/${eventId}/runs`, { cookie: cookie.timekeeper, body: { entryId, direction: 'out', startedAt: new Date().toISOString() } })

// The steps of one entry's inspections, in their order: the failed inspection, then the re-inspection.
describe('an inspection from start to clearance', { shuffle: false }, () => {
  it('an entry with no inspection cannot start a run (409 with why)', async () => {
    const fresh = await newEntry(eventId, 'Cinder Quill')
    const r = await call('POST', `/api/events/${eventId}/runs`, { cookie: cookie.timekeeper, body: { entryId: fresh, direction: 'out', startedAt: new Date().toISOString() } })
    expect(r.status).toBe(409)
    expect(r.body.statusMessage).toContain('no technical inspection yet')
  })

  it('an electric machine is never inspected on a checklist without the high-voltage items', async () => {
    // UN ECE Regulation 100, 5.1.3: isolation and bonding are measured on every electric machine; the combustion
    // checklist has neither. Nothing is started.
    const wrong = await call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId, baseId: 'combustion-motorcycle' } })
    expect(wrong.status).toBe(422)
    expect(wrong.body.data.issues).toEqual([{ path: 'baseId', message: 'the Combustion motorcycle checklist has no high-voltage items (isolation, bonding); an electric machine is inspected on one that measures isolation and bonding' }])
  })

  it('refuses an incomplete inspection naming the missing items, then a failed item keeps the entry from running', async () => {
    const started = await call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
    expect(started.status).toBe(201)
    const id = started.body.id
    expect(started.body.checklist.version).toBe(1)
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: FIGURES })

    const early = await call('POST', `/api/inspections/${id}/signatures`, { cookie: cookie.scrutineer, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } })
    expect(early.status).toBe(422)
    expect(early.body.data.issues[0].path).toBe('items')
    expect(early.body.data.missing).toHaveLength(allItems(electricMotorcycle).length)

    // A wrong unit and a value out of range answer with a message by the field.
    const wrongUnit = await answer(id, { itemKey: 'isolation', result: 'pass', value: 400, unit: 'V' })
    expect(wrongUnit.status).toBe(422)
    expect(wrongUnit.body.data.issues[0]).toMatchObject({ path: 'unit' })
    const low = await answer(id, { itemKey: 'isolation', result: 'fail', value: 30, unit: 'kΩ' })
    // UN ECE Regulation 100, 5.1.3: 30 kΩ on a 400 V DC bus is 75 Ω/V, under the 100 Ω/V needed.
    expect(low.body.verdict).toEqual({ withinLimit: false, message: '75.0 Ω/V at 400 V DC is under the 100 Ω/V needed' })
    // A count with a fraction is refused by its field; pounds are stored in kilograms exactly
    // (1 lb = 0.45359237 kg, international yard and pound agreement of 1959; NIST SP 811).
    const half = await answer(id, { itemKey: 'parachute', result: 'pass', value: '1.5', unit: 'count' })
    expect(half.status).toBe(422)
    expect(half.body.data.issues[0]).toMatchObject({ path: 'value', message: 'must be a whole number' })
    const pounds = await answer(id, { itemKey: 'mass', result: 'pass', value: '400', unit: 'lb' })
    expect(pounds.body.answer).toMatchObject({ value: '181.436948', enteredAs: '400 lb' })
    // The declared speed in mph is stored in km/h exactly: 186.4 mph = 299.9817216 km/h (1 mile = 1.609344 km).
    const mph = await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: { declaredSpeed: '186.4', declaredUnit: 'mph' } })
    expect(mph.body.declaredKmh).toBe('299.9817216')
    const tyre = await answer(id, { itemKey: 'tyres-rated', result: 'pass', value: 270, unit: 'km/h' })
    expect(tyre.body.verdict).toEqual({
      withinLimit: false,
      message: 'rated 270 km/h, declared top speed 299.9817216 km/h: rated under the declared speed',
    })
    const alone = await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: { busVoltageV: 400 } })
    expect(alone.status).toBe(422)
    expect(alone.body.data.issues[0]).toMatchObject({ path: 'busKind' })
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: FIGURES })

    await answerAll(id, 'helmet')
    const wrongPassword = await call('POST', `/api/inspections/${id}/signatures`, { cookie: cookie.scrutineer, body: { password: 'nope', typedName: 'Selma Scrute' } })
    expect(wrongPassword.status).toBe(422)
    expect(wrongPassword.body.data.issues[0].path).toBe('password')
    expect((await db.query('select signature_id from inspections where id = $1', [id])).rows[0].signature_id).toBeNull()

    const signed = await call('POST', `/api/inspections/${id}/signatures`, { cookie: cookie.scrutineer, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } })
    expect(signed.status).toBe(201)
    const run = await startRun()
    expect(run.status).toBe(409)
    expect(run.body.statusMessage).toContain('failed: Helmet to the current approved standard')

    // Signed means immutable, in PostgreSQL itself and through the API.
    expect((await answer(id, { itemKey: 'helmet', result: 'pass' })).status).toBe(409)
    await expect(db.query('update inspections set bus_voltage_v = 1 where id = $1', [id])).rejects.toThrow(/immutable/)
    await expect(db.query(`update inspection_answers set result = 'pass' where inspection_id = $1`, [id])).rejects.toThrow(/immutable/)
    await expect(db.query('delete from inspections where id = $1', [id])).rejects.toThrow(/immutable/)
  })

  it('a re-inspection is a new inspection; once signed with no failed item the entry runs', async () => {
    const list = (await call('GET', `/api/events/${eventId}/inspections`, { cookie: cookie.team2 })).body
    const previous = list.find((e: { id: number }) => e.id === entryId).inspectionId
    const again = await call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
    expect(again.status).toBe(201)
    expect(again.body.previousId).toBe(previous)
    await call('PATCH', `/api/inspections/${again.body.id}`, { cookie: cookie.scrutineer, body: FIGURES })
    await answerAll(again.body.id)
    const signed = await call('POST', `/api/inspections/${again.body.id}/signatures`, { cookie: cookie.scrutineer, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } })
    expect(signed.status).toBe(201)
    const team = (await call('GET', `/api/events/${eventId}/inspections`, { cookie: cookie.team2 })).body
    expect(team.find((e: { id: number }) => e.id === entryId)).toMatchObject({ cleared: true })
    // The other team does not see this entry at all.
    expect((await call('GET', `/api/events/${eventId}/inspections`, { cookie: cookie.team })).body.some((e: { id: number }) => e.id === entryId)).toBe(false)
    expect((await call('GET', `/api/inspections/${again.body.id}`, { cookie: cookie.team })).status).toBe(404)
    expect((await db.query('select count(*) from inspections where entry_id = $1', [entryId])).rows[0].count).toBe('2')
    expect((await startRun()).status).toBe(201)

    const report = await call('GET', `/api/signatures/${signed.body.id}`, { cookie: cookie.official })
    expect(report.body).toMatchObject({ kind: 'inspection', storedContentMatches: true, recordStillMatches: true, typedName: 'Selma Scrute' })
  })
})

describe('signing an inspection while an answer changes', () => {
  it('signs exactly what is stored: the answer lands before the signature, or is refused after it', async () => {
    const fresh = await newEntry(eventId, 'Cinder Race')
    const started = await call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId: fresh, baseId: 'electric-motorcycle' } })
    const id = started.body.id
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: FIGURES })
    await answerAll(id)
    const [signed, answered] = await Promise.all([
      call('POST', `/api/inspections/${id}/signatures`, { cookie: cookie.scrutineer, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } }),
      answer(id, { itemKey: 'mass', result: 'pass', value: 190.5, unit: 'kg' }),
    ])
    expect(signed.status).toBe(201)
    expect([200, 409]).toContain(answered.status)
    const report = (await call('GET', `/api/signatures/${signed.body.id}`, { cookie: cookie.official })).body
    expect(report.recordStillMatches).toBe(true)
    const mass = report.content.answers.find((x: any) => x.item === 'mass')
    expect(Number(mass.value) === 190.5).toBe(answered.status === 200)
  })
})

describe('checklists', () => {
  it('the organiser adapts a template; the copy has a new version and keeps the sources', async () => {
    // Other test files adapt the same template in the shared demo event: the version counts their copies.
    const before = (await call('GET', `/api/events/${eventId}/checklists`, { cookie: cookie.organiser })).body.event
      .filter((c: any) => c.baseId === 'electric-motorcycle').length
    const r = await call('POST', `/api/events/${eventId}/checklists`, { cookie: cookie.organiser, body: { baseId: 'electric-motorcycle', removeItems: ['lenses-taped'], addItems: [{ section: 'Machine', label: 'Fairing fasteners wired' }], note: 'local rulebook, article 12' } })
    expect(r.status).toBe(201)
    const items = r.body.content.sections.flatMap((s: any) => s.items)
    expect(items.some((i: any) => i.key === 'lenses-taped')).toBe(false)
    expect(items.find((i: any) => i.label === 'Fairing fasteners wired').source).toBe('added by the organiser: local rulebook, article 12')
    expect(r.body.content.version).toBe(1 + before + 1)
    const unknown = await call('POST', `/api/events/${eventId}/checklists`, { cookie: cookie.organiser, body: { baseId: 'electric-motorcycle', removeItems: ['nope'], note: 'x rule' } })
    expect(unknown.status).toBe(422)
  })

  it('leaves out a safety item only with the rulebook article that allows it and a scrutineer\'s signature', async () => {
    // UN ECE Regulation 100, 5.1.3 (isolation) and common practice (the make-safe procedure): safety items.
    const adapt = (body: Record<string, unknown>) => call('POST', `/api/events/${eventId}/checklists`, {
      cookie: cookie.organiser, body: { baseId: 'electric-motorcycle', note: 'local rulebook, article 3', ...body },
    })
    const bare = await adapt({ removeItems: ['isolation', 'make-safe-procedure'] })
    expect(bare.status).toBe(422)
    expect(bare.body.data.issues[0].path).toBe('safetyRemovals')
    expect(bare.body.data.issues[0].message).toContain('a safety item; name the rulebook article that allows it')
    const stray = await adapt({ removeItems: [], safetyRemovals: [{ itemKey: 'helmet', reference: 'art. 9' }] })
    expect(stray.status).toBe(422)
    expect(stray.body.data.issues[0].message).toContain('not a safety item left out: helmet')
    // A machine with no parachute, allowed below the speed by the (invented) local rulebook's article 7.2.
    const copy = await adapt({ removeItems: ['parachute'], safetyRemovals: [{ itemKey: 'parachute', reference: 'local rulebook, article 7.2' }] })
    expect(copy.status, JSON.stringify(copy.body)).toBe(201)
    expect(copy.body.content.removedSafetyItems).toEqual([
      { key: 'parachute', label: 'Parachutes fitted and packed: how many', reference: 'local rulebook, article 7.2' },
    ])
    // Not used until a scrutineer signs it; the organiser cannot sign it.
    const fresh = await newEntry(eventId, 'Cinder Chuteless')
    const inspect = () => call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId: fresh, checklistId: copy.body.id } })
    const early = await inspect()
    expect(early.status).toBe(409)
    expect(early.body.statusMessage).toContain('a scrutineer must sign it')
    const sign = (who: string) => call('POST', `/api/checklists/${copy.body.id}/signatures`, { cookie: who, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } })
    expect((await sign(cookie.organiser)).status).toBe(403)
    const signed = await sign(cookie.scrutineer)
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    expect((await sign(cookie.scrutineer)).status).toBe(409)
    expect((await inspect()).status).toBe(201)
    const report = (await call('GET', `/api/signatures/${signed.body.id}`, { cookie: cookie.official })).body
    expect(report).toMatchObject({ kind: 'checklist', storedContentMatches: true, recordStillMatches: true })
    expect(report.content.removedSafetyItems[0].reference).toBe('local rulebook, article 7.2')
    // The signed copy is immutable: the database refuses a change behind the app.
    await expect(db.query('update checklists set note = $1 where id = $2', ['changed', copy.body.id])).rejects.toThrow()
  })
})

describe('witness statements', () => {
  it('an official signs a statement; the team reads it; it is withdrawn only by a new signed statement', async () => {
    const official = await invitedPerson('official')
    const attempts = (await call('GET', `/api/events/${eventId}/live`, { cookie: official.cookie })).body
    const attempt = attempts.find((a: any) => a.entry.teamName === 'Larkspur Works')
    const body = { attemptId: attempt.id, runsSeen: 'runs 1 and 2', position: 'beside the mile exit trap', conditions: 'light wind from the south, dry surface', irregularities: '', password: official.password, typedName: official.name }
    expect((await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, password: 'wrong' } })).status).toBe(422)
    const created = await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body })
    expect(created.status).toBe(201)
    const forTeam = (await call('GET', `/api/events/${eventId}/statements`, { cookie: cookie.team })).body
    expect(forTeam.some((s: any) => s.id === created.body.id)).toBe(true)
    const forOtherTeam = (await call('GET', `/api/events/${eventId}/statements`, { cookie: cookie.team2 })).body
    expect(forOtherTeam.some((s: any) => s.id === created.body.id)).toBe(false)

    await expect(db.query(`update witness_statements set conditions = 'x' where id = $1`, [created.body.id])).rejects.toThrow(/immutable/)
    // One statement per official and attempt while it stands: a second is refused, naming the first.
    const second = await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, position: 'at the timing hut' } })
    expect(second.status).toBe(409)
    expect(second.body.statusMessage).toContain(`#${created.body.id}`)
    const withdrawn = await call('POST', `/api/statements/${created.body.id}/withdrawals`, { cookie: official.cookie, body: { reason: 'wrote the wrong attempt', password: official.password, typedName: official.name } })
    expect(withdrawn.status).toBe(201)
    expect(withdrawn.body.withdrawsId).toBe(created.body.id)
    expect((await call('POST', `/api/statements/${created.body.id}/withdrawals`, { cookie: official.cookie, body: { reason: 'again', password: official.password, typedName: official.name } })).status).toBe(409)
    // Withdrawn, the first no longer stands: the official may write another.
    expect((await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, position: 'at the timing hut' } })).status).toBe(201)
    const list = (await call('GET', `/api/events/${eventId}/statements`, { cookie: cookie.team })).body
    expect(list.find((s: any) => s.id === created.body.id).withdrawnBy).toMatchObject({ id: withdrawn.body.id, reason: 'wrote the wrong attempt' })
  })

  it('the runs seen are ticked from the attempt\'s own runs, kept apart from the official\'s own words', async () => {
    const official = await invitedPerson('official')
    const attempts = (await call('GET', `/api/events/${eventId}/live`, { cookie: official.cookie })).body
    const [attempt, other] = attempts.filter((a: any) => a.runs.length >= 1)
    const runIds = attempt.runs.map((r: any) => r.id)
    const body = { attemptId: attempt.id, position: 'timing hut', conditions: 'calm', irregularities: '', password: official.password, typedName: official.name }
    const post = (more: Record<string, unknown>) => call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, ...more } })
    expect((await post({})).body.data.issues).toEqual([{ path: 'runsSeen', message: 'tick the runs you saw, or say which' }])
    const foreign = await post({ runIdsSeen: [runIds[0], other.runs[0].id] })
    expect(foreign.body.data.issues).toEqual([{ path: 'runIdsSeen', message: `#${other.runs[0].id} is not a run of this attempt` }])
    // Ticked in any order, twice even: signed once each, in order; the words stay as typed, beside them.
    const created = await post({ runIdsSeen: [...runIds].reverse().concat(runIds[0]), runsSeen: 'the second from the tower' })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body).toMatchObject({ runIdsSeen: [...runIds].sort((a: number, b: number) => a - b), runsSeen: 'the second from the tower' })
    const list = (await call('GET', `/api/events/${eventId}/statements`, { cookie: cookie.official })).body
    const report = (await call('GET', `/api/signatures/${list.find((s: any) => s.id === created.body.id).signatureId}`, { cookie: cookie.official })).body
    expect(report).toMatchObject({ storedContentMatches: true, recordStillMatches: true })
    expect(report.content).toMatchObject({ runIdsSeen: created.body.runIdsSeen, runsSeen: 'the second from the tower' })
  })

  it('an official who also holds a role in the attempt\'s team cannot witness it', async () => {
    // Common practice: a witness is independent of the team whose attempt it witnesses.
    const official = await invitedPerson('official')
    const asTeam = await call('POST', `/api/events/${eventId}/people`, { cookie: cookie.organiser, body: { email: official.email, name: official.name, role: 'team', teamName: 'Larkspur Works' } })
    expect(asTeam.status).toBe(201)
    const attempts = (await call('GET', `/api/events/${eventId}/live`, { cookie: cookie.organiser })).body
    const larkspur = attempts.find((a: any) => a.entry.teamName === 'Larkspur Works')
    const cinder = attempts.find((a: any) => a.entry.teamName === 'Cinder Hollow Engineering')
    const body = { runsSeen: 'run 1', position: 'timing hut', conditions: 'calm', irregularities: '', password: official.password, typedName: official.name }
    const own = await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, attemptId: larkspur.id } })
    expect(own.status).toBe(409)
    expect(own.body.statusMessage).toContain('Not independent: you hold a role in the team “Larkspur Works”, so you cannot witness this team\'s attempt')
    expect((await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { ...body, attemptId: cinder.id } })).status).toBe(201)
  })

  it('a signature whose stored content was altered behind the app no longer matches its hash', async () => {
    // A statement of this test's own, by an official of its own, so that no other test's record is touched.
    const official = await invitedPerson('official')
    const attempts = (await call('GET', `/api/events/${eventId}/live`, { cookie: official.cookie })).body
    const attempt = attempts.find((a: any) => a.entry.teamName === 'Larkspur Works')
    const created = await call('POST', `/api/events/${eventId}/statements`, { cookie: official.cookie, body: { attemptId: attempt.id, runsSeen: 'run 1', position: 'timing hut', conditions: 'calm', irregularities: '', password: official.password, typedName: official.name } })
    expect(created.status).toBe(201)
    const list = (await call('GET', `/api/events/${eventId}/statements`, { cookie: cookie.official })).body
    const sigId = list.find((s: any) => s.id === created.body.id).signatureId
    expect((await call('GET', `/api/signatures/${sigId}`, { cookie: cookie.official })).body.storedContentMatches).toBe(true)
    // Simulate tampering straight in the database, past the append-only trigger.
    await db.query('alter table signatures disable trigger signatures_append_only')
    try {
      await db.query(`update signatures set content = jsonb_set(content, '{reason}', '"altered"') where id = $1`, [sigId])
    }
    finally {
      await db.query('alter table signatures enable trigger signatures_append_only')
    }
    const report = await call('GET', `/api/signatures/${sigId}`, { cookie: cookie.official })
    expect(report.body.storedContentMatches).toBe(false)
  })
})

describe('not applicable by what the machine is', () => {
  it('a parachute is not applicable only on an unstreamlined machine as seen, with the reason written', async () => {
    // Club rules (from memory): a parachute above 175 mph of declared speed on streamlined machines; an unstreamlined
    // motorcycle carries none. 290 km/h is 180.2 mph (1 mile = 1.609344 km, NIST SP 811): over 175 mph.
    const bare = await newEntry(eventId, 'Cinder Naked', {}, { team: cookie.team2, entry: { className: 'Electric, unstreamlined', division: 'none' } })
    const started = await call('POST', `/api/events/${eventId}/inspections`, { cookie: cookie.scrutineer, body: { entryId: bare, baseId: 'electric-motorcycle' } })
    expect(started.status).toBe(201)
    const id = started.body.id
    const { division: _, ...noDivision } = FIGURES
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: noDivision })
    const na = (note?: string) => answer(id, { itemKey: 'parachute', result: 'na', ...(note ? { note } : {}) })
    expect((await na('no parachute mount')).body.data.issues[0]).toEqual({
      path: 'result', message: 'is not applicable only where the machine is unstreamlined: confirm the division seen first',
    })
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: { division: 'none' } })
    expect((await na()).body.data.issues[0]).toEqual({ path: 'note', message: 'say why the item does not apply to this machine' })
    expect((await na('unstreamlined: no parachute carried')).status).toBe(200)
    // Items that never allow it are refused, whatever the machine.
    expect((await answer(id, { itemKey: 'tyres-rated', result: 'na', note: 'slicks' })).body.data.issues[0])
      .toEqual({ path: 'result', message: 'this item cannot be marked not applicable' })
    await answerAll(id, 'parachute', { scrutineer: cookie.scrutineer }) // every other item passed
    await na('unstreamlined: no parachute carried')
    await answer(id, { itemKey: 'canopy-exit', result: 'na', note: 'no canopy' })

    // The scrutineer then sees a partial fairing: the parachute's "not applicable" no longer holds at signing.
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: { division: 'partial' } })
    const sign = () => call('POST', `/api/inspections/${id}/signatures`, { cookie: cookie.scrutineer, body: { password: DEMO_PASSWORD, typedName: 'Selma Scrute' } })
    const refused = await sign()
    expect(refused.status).toBe(422)
    expect(refused.body.data.issues[0]).toEqual({
      path: 'items',
      message: 'marked not applicable: Parachutes fitted and packed: how many is not applicable only where the machine is '
        + 'unstreamlined; this one is partially streamlined',
    })
    await call('PATCH', `/api/inspections/${id}`, { cookie: cookie.scrutineer, body: { division: 'none' } })
    expect((await sign()).status).toBe(201)
    const view = (await call('GET', `/api/inspections/${id}`, { cookie: cookie.scrutineer })).body
    expect(view.clearance).toMatchObject({ cleared: true })
  })
})
