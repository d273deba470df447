import { resolve } from 'node:path'
import { afterAll, beforeAll, expect, inject, it } from 'vitest'
import type { LiveMessage } from '#shared/types/live'
import { applyLiveMessage } from '../../app/composables/useLiveResults'
import { call, invitedPerson, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { openLiveStream } from '../support/live-stream'
import { startApp, type Started } from '../support/processes'
import { eventClockTime, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Live results pushed by server-sent events (WHATWG HTML, "Server-sent events": `event:` and `data:` lines,
// a blank line ends a message), announced by PostgreSQL's LISTEN/NOTIFY so that a second app server on the
// same database pushes what the first one wrote.
let event: TestEvent
let second: Started
let entryId = 0

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  entryId = await clearedEntry(event.eventId, 'Pushed Arrow', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const env = JSON.parse(inject('serverEnv'))
  second = await startApp(env.output, {
    NUXT_DATABASE_URL: env.databaseUrl,
    NUXT_DATA_DIR: resolve(env.runDir, 'live-server-2'),
    NUXT_SEAL_DIR: resolve(env.dataDir, 'seal'),
    NUXT_MAIL_PORT: String(env.smtpPort),
    NUXT_SEED_DEMO: 'true',
  })
})

afterAll(async () => {
  await second?.stop()
})

const deltaAfter = (version: number) => (m: LiveMessage) => m.kind === 'delta' && m.version > version

it('pushes a reading written through one server to clients of both within a second, as what changed', async () => {
  const here = await openLiveStream(inject('baseUrl').replace(/\/$/, ''), event.eventId, event.cookie.team)
  const there = await openLiveStream(`http://127.0.0.1:${second.port}`, event.eventId, event.cookie.official)
  try {
    expect(here.status).toBe(200)
    expect(here.type).toMatch(/^text\/event-stream/)
    const first = await here.next(m => m.kind === 'full')
    expect(first.event).toBe('live')
    await there.next(m => m.kind === 'full')

    const start = minutesAgo(5)
    const run = await call('POST', `/api/events/${event.eventId}/runs`, {
      cookie: event.cookie.timekeeper,
      body: { entryId, direction: 'out', startedAt: new Date(start).toISOString() },
    })
    expect(run.status).toBe(201)
    const afterRun = await there.next(m => m.kind === 'delta' && m.changed.some(a => a.id === run.body.attemptId))
    const version = (afterRun.msg as { version: number }).version
    const seen = { there: there.messages.length }

    const reading = (trap: 'K-in' | 'K-out', offsetS: number) => call('POST', `/api/runs/${run.body.id}/readings`, {
      cookie: event.cookie.timekeeper,
      body: { trapId: event.traps[trap], systemId: event.systems.primary, time: eventClockTime(start + offsetS * 1000, 'UTC') },
    })
    expect((await reading('K-in', 60)).status).toBe(201)
    const entered = (await there.next(deltaAfter(version), seen.there)).msg as { version: number }
    const before = { here: here.messages.length, there: there.messages.length }
    // The exit trap 9 s later: 1000 m in 9 s, the run's speed appears (400.000 km/h; 1 km/h = 1/3.6 m/s).
    expect((await reading('K-out', 69)).status).toBe(201)
    const answered = Date.now()
    const pushedHere = await here.next(deltaAfter(entered.version), before.here)
    const pushedThere = await there.next(deltaAfter(entered.version), before.there)
    // Within a second of the write's answer (the notice goes out at commit, so it may even come first).
    expect(pushedHere.at - answered).toBeLessThan(1000)
    expect(pushedThere.at - answered).toBeLessThan(1000)

    // Only the attempt that changed travels; applied to what the client held, it is what a full read gives.
    const delta = pushedThere.msg as Extract<LiveMessage, { kind: 'delta' }>
    expect(delta.changed.map(a => a.id)).toEqual([run.body.attemptId])
    const live = await call('GET', `/api/events/${event.eventId}/live`, { cookie: event.cookie.official })
    let held: any = null
    let at: number | null = null
    for (const { msg } of there.messages.filter(m => m.msg.kind !== 'tick')) {
      held = applyLiveMessage(held, at, msg) ?? held
      at = (msg as { version: number }).version
    }
    expect(held).toEqual(live.body)
    expect(held.find((a: any) => a.id === run.body.attemptId).runs[0].official.kmh).toBe('400.000')
  }
  finally {
    here.close()
    there.close()
  }
})

it('ends an open stream within seconds when the person\'s role is removed', async () => {
  const person = await invitedPerson('official', 'first-password-1', 'Streaming official', { eventId: event.eventId, organiser: event.cookie.organiser })
  const stream = await openLiveStream(inject('baseUrl').replace(/\/$/, ''), event.eventId, person.cookie)
  try {
    expect(stream.status).toBe(200)
    await stream.next(m => m.kind === 'full')
    const people = (await call('GET', `/api/events/${event.eventId}/people`, { cookie: event.cookie.organiser })).body as { email: string, membershipId: number }[]
    const removedAt = Date.now()
    const membership = people.find(p => p.email === person.email)!.membershipId
    expect((await call('DELETE', `/api/events/${event.eventId}/people/${membership}`, { cookie: event.cookie.organiser })).status).toBe(204)
    // Checked every 3 s on the server: ended well within 10 s, not at the stream's five-minute end.
    await expect.poll(() => stream.state.endedAt, { timeout: 10_000, interval: 100 }).not.toBeNull()
    expect(stream.state.endedAt! - removedAt).toBeLessThan(10_000)
    expect((await call('GET', `/api/events/${event.eventId}/live-stream`, { cookie: person.cookie })).status).toBe(404)
  }
  finally {
    stream.close()
  }
})

it('refuses the stream to anyone without a role at the event', async () => {
  const anonymous = await call('GET', `/api/events/${event.eventId}/live-stream`)
  expect(anonymous.status).toBe(401)
})
