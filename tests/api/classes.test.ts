import { beforeAll, expect, it } from 'vitest'
import { call, url, useTestServer } from '../support/api'
import { answerAll, clearedEntry, FIGURES, newEntry } from '../support/entries'
import { form, pdf } from '../support/files'
import { kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()
let event: TestEvent

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
})

const adapt = (body: Record<string, unknown>) => call('PUT', `/api/events/${event.eventId}/profile`, {
  cookie: event.cookie.organiser,
  body: { baseId: 'intl-motorcycle', source: 'local rulebook 2026, article 4 (invented for the test)', ...body },
})

it('the organiser adapts the class list with a stated source; entries then pick from it', async () => {
  expect((await adapt({ removeClasses: ['no such class'] })).body.data.issues[0]).toMatchObject({ path: 'removeClasses' })
  expect((await adapt({ addClasses: [{ label: 'electric, FULLY streamlined', propulsion: 'electric' }] })).body.data.issues[0])
    .toMatchObject({ path: 'addClasses' })
  const adapted = await adapt({
    removeClasses: ['Electric, unstreamlined'],
    addClasses: [{ label: 'Electric, sidecar', propulsion: 'electric', massKg: { over: 0, upTo: 400 } }],
  })
  expect(adapted.status, JSON.stringify(adapted.body)).toBe(200)
  expect(adapted.body.classes.source).toBe('adapted by the organiser: local rulebook 2026, article 4 (invented for the test)')
  const labels = adapted.body.classes.value.map((c: any) => c.label)
  expect(labels).toContain('Electric, sidecar')
  expect(labels).not.toContain('Electric, unstreamlined')
  const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.team })).body
  const entry = (className: string) => call('POST', `/api/events/${event.eventId}/entries`, {
    cookie: event.cookie.team,
    body: { machine: { name: `Class Runner ${className.length}`, power: 'electric', declaredMassKg: '300.0', division: 'none' }, rider: { name: 'Test Rider', licenceNo: 'DEMO-T-2', licenceExpires: '2099-12-31' }, className, distanceId: setup.distances[0].id },
  })
  expect((await entry('Electric, sidecar')).status).toBe(201)
  expect((await entry('Electric, unstreamlined')).body.data.issues[0]).toMatchObject({ path: 'className' })
})

it('the class list changes on its own, keeping the profile\'s other adapted values', async () => {
  const window = await adapt({ windowMinutes: 45 })
  expect(window.status).toBe(200)
  const put = (body: Record<string, unknown>) => call('PUT', `/api/events/${event.eventId}/classes`, { cookie: event.cookie.organiser, body })
  expect((await put({ removeClasses: ['Electric, partially streamlined'] })).body.data.issues[0]).toMatchObject({ path: 'source' })
  const saved = await put({ removeClasses: ['Electric, partially streamlined'], addClasses: [{ label: 'Electric, tricycle', propulsion: 'electric' }], source: 'local rulebook 2026, article 5' })
  expect(saved.status, JSON.stringify(saved.body)).toBe(200)
  expect(saved.body.value.map((c: any) => c.label)).toEqual(expect.arrayContaining(['Electric, tricycle', 'Electric, fully streamlined']))
  expect(saved.body.value.map((c: any) => c.label)).not.toContain('Electric, partially streamlined')
  const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.organiser })).body
  expect(setup.event.profile.window.value.minutes).toBe(45) // the adapted window stays
  expect(setup.event.profile.version).toBe(window.body.version + 1)
})

it('refuses at entry a machine whose propulsion the class is not for; a hybrid enters only a hybrid class', async () => {
  // No library profile lists a hybrid class (none is known from the rulebooks here): a hybrid machine is refused at
  // entry, saying so, until the organiser adds a class for it with its rulebook (common practice: the class decides).
  const setup = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.team })).body
  const enter = (name: string, power: string, className: string) => call('POST', `/api/events/${event.eventId}/entries`, {
    cookie: event.cookie.team,
    body: { machine: { name, power, declaredMassKg: '240.0', division: 'partial' }, rider: { name: 'Test Rider', licenceNo: 'DEMO-T-3', licenceExpires: '2099-12-31' }, className, distanceId: setup.distances[0].id },
  })
  const hybrid = await enter('Twin Heart', 'hybrid', 'Electric, fully streamlined')
  expect(hybrid.status).toBe(422)
  expect(hybrid.body.data.issues[0]).toEqual({
    path: 'className',
    message: 'is a class for electric machines; the machine is hybrid, and no class of this event takes a hybrid machine '
      + '(the organiser can add one, with its rulebook)',
  })
  const electric = await enter('Quiet One', 'electric', 'Combustion, over 750 cm³ up to 1000 cm³, partially streamlined')
  expect(electric.body.data.issues[0]).toEqual({ path: 'className', message: 'is a class for combustion machines; the machine is electric' })
  const entries = (await call('GET', `/api/events/${event.eventId}/setup`, { cookie: event.cookie.team })).body.entries
  expect(entries.map((e: any) => e.machineName)).not.toContain('Twin Heart') // no entry half-written
  const added = await call('PUT', `/api/events/${event.eventId}/classes`, {
    cookie: event.cookie.organiser,
    body: { addClasses: [{ label: 'Hybrid, fully streamlined', propulsion: 'hybrid', division: 'full' }], source: 'local rulebook 2026, article 6 (invented for the test)' },
  })
  expect(added.status, JSON.stringify(added.body)).toBe(200)
  expect((await enter('Twin Heart', 'hybrid', 'hybrid, fully streamlined')).status).toBe(201)
})

it('the scrutineer confirms the division seen before signing; the class is judged on it, not on the declaration', async () => {
  // The motorcycle classes go by streamlining division (FIM extract: unstreamlined, partially, fully streamlined); the
  // division is what the scrutineer sees, the team only declares it (common practice of technical inspection).
  const who = { team: event.cookie.team, scrutineer: event.cookie.scrutineer }
  const entryId = await newEntry(event.eventId, 'Declared Full', {}, { ...who, entry: { className: 'Electric, fully streamlined', division: 'full' } })
  const started = await call('POST', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.scrutineer, body: { entryId, baseId: 'electric-motorcycle' } })
  expect(started.status, JSON.stringify(started.body)).toBe(201)
  const id = started.body.id
  const { division: _, ...noDivision } = FIGURES
  expect((await call('PATCH', `/api/inspections/${id}`, { cookie: event.cookie.scrutineer, body: noDivision })).status).toBe(200)
  await answerAll(id, undefined, { scrutineer: event.cookie.scrutineer })
  const view = (await call('GET', `/api/inspections/${id}`, { cookie: event.cookie.scrutineer })).body
  expect(view.division).toEqual({ declared: 'full', classGoesBy: 'full' })
  const sign = () => call('POST', `/api/inspections/${id}/signatures`, { cookie: event.cookie.scrutineer, body: { password: 'first-password-1', typedName: 'Test scrutineer' } })
  const refused = await sign()
  expect(refused.status).toBe(422)
  expect(refused.body.data.issues[0]).toEqual({
    path: 'division', message: 'confirm the streamlining division you see: the class (Electric, fully streamlined) goes by it',
  })
  expect((await call('PATCH', `/api/inspections/${id}`, { cookie: event.cookie.scrutineer, body: { division: 'fully' } })).body.data.issues[0])
    .toMatchObject({ path: 'division' })
  // Seen partially streamlined (no tail section, say): signed, and the machine is then outside the class entered.
  expect((await call('PATCH', `/api/inspections/${id}`, { cookie: event.cookie.scrutineer, body: { division: 'partial' } })).status).toBe(200)
  const signed = await sign()
  expect(signed.status, JSON.stringify(signed.body)).toBe(201)
  const report = (await call('GET', `/api/signatures/${signed.body.id}`, { cookie: event.cookie.official })).body
  expect(report.content.division).toBe('partial')
  const place = { ...event, timekeeper: event.cookie.timekeeper }
  const run = await kilometreRun(place, entryId, 'out', Math.ceil(Date.now() / 1000) * 1000 + 1000, { primary: [0, 10], backup: [0, 10] })
  const live = (await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.team })).body
    .find((a: any) => a.id === run.attemptId)
  const outside = live.findings.find((f: any) => f.code === 'class.outside')
  expect(outside.message).toContain('division: the class is fully streamlined, the machine partially streamlined')
  const readiness = (await call('GET', `/api/attempts/${run.attemptId}/readiness`, { cookie: event.cookie.team })).body
  expect(readiness.items.find((i: any) => i.key === 'class')).toMatchObject({
    met: false, detail: 'division: the class is fully streamlined, the machine partially streamlined',
  })
})

it('a machine outside its class is a blocking finding; a class by mass asks for the scale\'s certificate', async () => {
  // Electric automobiles go by mass (up to 500 kg / 500–1000 kg / over 1000 kg: from memory of Appendix D's
  // classes). The test machine weighs 181.5 kg at its inspection (tests/support/entries.ts).
  const car = await newTestEvent('intl-automobile', 'UTC', 'Electric automobile, up to 500 kg')
  const who = { team: car.cookie.team, scrutineer: car.cookie.scrutineer, scrutineerPassword: 'first-password-1' }
  const place = { eventId: car.eventId, timeZone: 'UTC', timekeeper: car.cookie.timekeeper, traps: car.traps, systems: car.systems }
  const inClass = await clearedEntry(car.eventId, 'Light Car', {}, { ...who, entry: { className: 'Electric automobile, up to 500 kg' } })
  const heavy = await clearedEntry(car.eventId, 'Misclassed Car', {}, { ...who, entry: { className: 'Electric automobile, over 1000 kg' } })
  const live = async (attemptId: number) => (await call('GET', `/api/events/${car.eventId}/live`, { cookie: car.cookie.team })).body
    .find((a: any) => a.id === attemptId)
  const wrong = await kilometreRun(place, heavy, 'out', minutesAgo(20), { primary: [0, 10], backup: [0, 10] })
  const outside = (await live(wrong.attemptId)).findings.find((f: any) => f.code === 'class.outside')
  expect(outside).toMatchObject({ severity: 'fail' })
  expect(outside.message).toContain('mass: measured 181.5 kg')
  // Not even the stewards' to set aside: the scrutineer's measurement decides.
  const officialId = (await call('GET', '/api/me', { cookie: car.cookie.official })).body.user.id
  const appointed = await call('POST', `/api/events/${car.eventId}/appointments`, { cookie: car.cookie.organiser, body: { function: 'steward', userId: officialId } })
  expect(appointed.status, JSON.stringify(appointed.body)).toBe(201)
  const setAside = await call('POST', `/api/attempts/${wrong.attemptId}/set-asides`, {
    cookie: car.cookie.official,
    body: { code: 'class.outside', runId: null, reason: 'the scale was surely wrong that day', typedName: 'Test official', password: 'first-password-1' },
  })
  expect(setAside.status).toBe(422)
  expect(setAside.body.data.issues[0]).toMatchObject({ path: 'code', message: expect.stringContaining('can never be set aside: the machine fits its class') })

  // Left the line now, after the inspection that cleared it (the one readiness judges the run on).
  const right = await kilometreRun(place, inClass, 'out', Math.ceil(Date.now() / 1000) * 1000, { primary: [0, 10], backup: [0, 10] })
  expect((await live(right.attemptId)).findings.map((f: any) => f.code)).not.toContain('class.outside')
  const scale = async () => (await call('GET', `/api/attempts/${right.attemptId}/readiness`, { cookie: car.cookie.team })).body
    .items.find((i: any) => i.key === 'scale')
  expect((await scale()).met).toBe(false)
  const inspections = (await call('GET', `/api/events/${car.eventId}/inspections`, { cookie: car.cookie.scrutineer })).body
  const inspectionId = inspections.find((e: any) => e.id === inClass).inspectionId
  const body = form({ kind: 'scale-certificate', inspectionId }, { name: 'scale.pdf', bytes: pdf('scale certificate'), type: 'application/pdf' })
  const up = await fetch(url(`/api/events/${car.eventId}/evidence`), { method: 'POST', headers: { cookie: car.cookie.scrutineer }, body })
  expect(up.status, await up.clone().text()).toBe(201)
  expect(await scale()).toMatchObject({ met: true, detail: `scale.pdf, on inspection #${inspectionId}` })
})
