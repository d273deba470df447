import { beforeAll, expect, it } from 'vitest'
import { call, url, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { eventClockTime, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Idempotency-Key (IETF HTTP API draft "The Idempotency-Key HTTP Header Field"): a resend of a request with
// the same key gets the first answer and changes nothing; a key names one request only.
let event: TestEvent
let runId = 0
let start = 0

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  const entryId = await clearedEntry(event.eventId, 'Twice Sent', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  start = minutesAgo(5)
  const run = await call('POST', `/api/events/${event.eventId}/runs`, {
    cookie: event.cookie.timekeeper, body: { entryId, direction: 'out', startedAt: new Date(start).toISOString() },
  })
  runId = run.body.id
})

const send = (path: string, key: string, body: unknown) => fetch(url(path), {
  method: 'POST',
  headers: { 'cookie': event.cookie.timekeeper, 'content-type': 'application/json', 'idempotency-key': key },
  body: JSON.stringify(body),
})
const readingsOf = async () => (await call('GET', `/api/events/${event.eventId}/run-sheet`, { cookie: event.cookie.timekeeper }))
  .body.history.filter((h: any) => h.runId === runId)

it('writes a reading once however often it is sent with its key, and answers each resend as the first', async () => {
  const body = { trapId: event.traps['K-in'], systemId: event.systems.primary, time: eventClockTime(start + 60_000, 'UTC') }
  const first = await send(`/api/runs/${runId}/readings`, 'offline-key-0001', body)
  expect(first.status).toBe(201)
  const firstBody = await first.json()
  const again = await send(`/api/runs/${runId}/readings`, 'offline-key-0001', body)
  expect(again.status).toBe(201)
  expect(again.headers.get('idempotent-replay')).toBe('true')
  expect(await again.json()).toEqual(firstBody)
  expect(await readingsOf()).toHaveLength(1)
  // The same time with a new key is a second write: refused, as a second time for the trap always is.
  const other = await send(`/api/runs/${runId}/readings`, 'offline-key-0002', body)
  expect(other.status).toBe(409)
  // A refusal is kept with its key too: the resend is refused the same way, and still nothing is written.
  const otherAgain = await send(`/api/runs/${runId}/readings`, 'offline-key-0002', body)
  expect(otherAgain.status).toBe(409)
  expect(otherAgain.headers.get('idempotent-replay')).toBe('true')
  expect(await readingsOf()).toHaveLength(1)
})

it('refuses a key used for another request, and a key that is not one, naming the header', async () => {
  const reused = await send(`/api/runs/${runId}/weather`, 'offline-key-0001', { windSpeedMs: '1', windFromDeg: '90' })
  expect(reused.status).toBe(422)
  expect((await reused.json()).data.issues[0]).toEqual({ path: 'Idempotency-Key', message: 'was already used for another request' })
  const bad = await send(`/api/runs/${runId}/weather`, 'x', { windSpeedMs: '1', windFromDeg: '90' })
  expect(bad.status).toBe(422)
  expect((await bad.json()).data.issues[0].path).toBe('Idempotency-Key')
})
