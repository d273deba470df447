import { beforeAll, expect, it } from 'vitest'
import { call, useTestServer } from '../support/api'
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
