import { beforeAll, describe, expect, it } from 'vitest'
import { call, invitedPerson, useTestServer } from '../support/api'
import { readyPair } from '../support/ready-attempt'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Independence, one check for every signed act: a person who holds a role in a team (its rider among them) never
// witnesses, times, inspects, sets aside, decides a protest or appeal, confirms a result, ratifies or homologates anything of that
// team, nor is appointed steward or observer where it competes (common practice of sporting codes: an official
// with an interest in a competitor does not judge it). The conflicted person here holds every official role at the
// test event and the functions that need an appointment, given before the team role was added, so that only
// independence stands between them and the act. Each act → 409 naming the team and the act, nothing written.
const idOf = async (cookie: string) => (await call('GET', '/api/me', { cookie })).body.user.id as number

let event: TestEvent
let conflicted: { cookie: string, name: string, password: string, id: number }
const ids = { attempt: 0, run: 0, entry: 0, inspection: 0, machine: 0, dossier: 0, protest: 0, appeal: 0 }

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'Europe/Paris')
  const pair = await readyPair(event, 'Independence machine')
  ids.attempt = pair.attemptId
  ids.run = pair.runIds[0]!
  ids.entry = pair.entryId
  const built = await call('POST', `/api/attempts/${ids.attempt}/dossiers`, { cookie: event.cookie.team })
  expect(built.status, JSON.stringify(built.body)).toBe(201)
  ids.dossier = built.body.id
  expect((await call('POST', `/api/dossiers/${ids.dossier}/submission`, { cookie: event.cookie.team })).status).toBe(201)
  const entry = (await call('GET', `/api/events/${event.eventId}/inspections`, { cookie: event.cookie.organiser })).body
    .find((i: { id: number }) => i.id === ids.entry)
  ids.inspection = entry.inspectionId
  ids.machine = entry.machineId

  // An independent steward (the event's official) and the person to be conflicted: an official, timekeeper and
  // scrutineer at the event, appointed steward and clerk of the course while of no team.
  const at = { eventId: event.eventId, organiser: event.cookie.organiser }
  const person = await invitedPerson('official', 'conflict-password-1', 'Conflicted Official', at)
  conflicted = { ...person, id: await idOf(person.cookie) }
  for (const role of ['timekeeper', 'scrutineer']) {
    const r = await call('POST', `/api/events/${event.eventId}/people`, { cookie: event.cookie.organiser, body: { email: person.email, name: person.name, role } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  }
  for (const [fn, userId] of [['steward', conflicted.id], ['clerk-of-course', conflicted.id], ['steward', await idOf(event.cookie.official)]] as const) {
    const r = await call('POST', `/api/events/${event.eventId}/appointments`, { cookie: event.cookie.organiser, body: { function: fn, userId } })
    expect([201, 409], JSON.stringify(r.body)).toContain(r.status)
  }
  // The team protests its own published timing; an independent steward dismisses it; the team appeals.
  const sign = (name: string) => ({ password: 'first-password-1', typedName: name })
  const protest = await call('POST', `/api/events/${event.eventId}/protests`, {
    cookie: event.cookie.team, body: { attemptId: ids.attempt, kind: 'timing', grounds: 'The backup printout was not shown to the team.', ...sign('Test team') },
  })
  expect(protest.status, JSON.stringify(protest.body)).toBe(201)
  ids.protest = protest.body.id
  const lodgeAgain = await call('POST', `/api/events/${event.eventId}/protests`, {
    cookie: event.cookie.team, body: { attemptId: ids.attempt, kind: 'result', grounds: 'The result was published before the wind was entered.', ...sign('Test team') },
  })
  expect(lodgeAgain.status).toBe(201)
  const decided = await call('POST', `/api/protests/${lodgeAgain.body.id}/decision`, { cookie: event.cookie.official, body: { ...decision, ...sign('Test official') } })
  expect(decided.status, JSON.stringify(decided.body)).toBe(201)
  const appeal = await call('POST', `/api/protests/${lodgeAgain.body.id}/appeals`, {
    cookie: event.cookie.team, body: { grounds: 'The stewards did not hear the wind observer.', ...sign('Test team') },
  })
  expect(appeal.status, JSON.stringify(appeal.body)).toBe(201)
  ids.appeal = appeal.body.id

  // Only now does the person join the team: every act below is refused for that alone.
  const joined = await call('POST', `/api/events/${event.eventId}/people`, { cookie: event.cookie.organiser, body: { email: person.email, name: person.name, role: 'team', teamName: 'Test Team' } })
  expect(joined.status, JSON.stringify(joined.body)).toBe(201)
}, 180_000)

const decision = {
  heardAt: new Date().toISOString(), present: 'Test Team', outcome: 'dismissed',
  hearing: 'The team was heard.', reasons: 'Both systems recorded the pass in order.',
}

describe('nobody of a team signs an act about it', () => {
  const signs = () => ({ password: conflicted.password, typedName: conflicted.name })
  const ACTS: [string, () => [string, string, Record<string, unknown>], string][] = [
    ['timing sheet', () => ['POST', `/api/attempts/${ids.attempt}/signatures`, signs()], 'sign or reopen the timing sheet of this team\'s attempt'],
    ['timing sheet reopened', () => ['POST', `/api/attempts/${ids.attempt}/reopen`, { ...signs(), reason: 'a reading to correct' }], 'sign or reopen the timing sheet of this team\'s attempt'],
    ['inspection', () => ['POST', `/api/inspections/${ids.inspection}/signatures`, signs()], 'sign the inspection of this team\'s machine'],
    ['witness statement', () => ['POST', `/api/events/${event.eventId}/statements`, { ...signs(), attemptId: ids.attempt, runsSeen: 'both', position: 'timing hut', conditions: 'calm' }], 'witness this team\'s attempt'],
    ['set-aside', () => ['POST', `/api/attempts/${ids.attempt}/set-asides`, { ...signs(), code: 'timing.cross-check', runId: ids.run, reason: 'the backup beam was knocked' }], 'set aside a finding of this team\'s attempt'],
    ['post-run check', () => ['POST', `/api/attempts/${ids.attempt}/post-run-check`, { ...signs(), massKg: 181 }], 'sign the post-run check of this team\'s attempt'],
    ['suspension', () => ['POST', `/api/machines/${ids.machine}/suspensions`, { ...signs(), reason: 'a loose fairing' }], 'suspend this team\'s machine'],
    ['start override', () => ['POST', `/api/entries/${ids.entry}/start-overrides`, { ...signs(), codes: ['licence.expired'], reason: 'renewal seen' }], 'let this team\'s entry start'],
    ['confirmation of the result', () => ['POST', `/api/attempts/${ids.attempt}/confirmations`, signs()], 'confirm this team\'s result'],
    ['ratification', () => ['POST', `/api/dossiers/${ids.dossier}/decision`, { ...signs(), decision: 'ratified', reasons: 'all in order' }], 'ratify this team\'s claim'],
    ['refusal', () => ['POST', `/api/dossiers/${ids.dossier}/decision`, { ...signs(), decision: 'refused', reasons: 'not in order' }], 'refuse this team\'s claim'],
    ['homologation', () => ['POST', `/api/dossiers/${ids.dossier}/homologation`, { ...signs(), reference: 'HOM-1', homologatedOn: '2026-12-01' }], 'enter the homologation of this team\'s record'],
    ['protest decision', () => ['POST', `/api/protests/${ids.protest}/decision`, { ...signs(), ...decision }], 'decide a protest that concerns this team'],
    ['appeal decision', () => ['POST', `/api/protests/${ids.appeal}/decision`, { ...signs(), ...decision }], 'decide an appeal that concerns this team'],
    ['appointment as steward', () => ['POST', `/api/events/${event.eventId}/appointments`, { function: 'steward', userId: conflicted.id }], 'be appointed steward at this event'],
    ['appointment as observer', () => ['POST', `/api/events/${event.eventId}/appointments`, { function: 'observer', userId: conflicted.id }], 'be appointed observer of the sanctioning body at this event'],
  ]

  it.each(ACTS)('%s: 409, naming the team and the act', async (_, request, act) => {
    const [method, path, body] = request()
    const cookie = path.includes('/appointments') ? event.cookie.organiser : conflicted.cookie
    const before = await call('GET', `/api/attempts/${ids.attempt}/timing-sheet`, { cookie: event.cookie.organiser })
    const r = await call(method, path, { cookie, body })
    expect(r.status, JSON.stringify(r.body)).toBe(409)
    expect(r.body.statusMessage).toBe(`Not independent: you hold a role in the team “Test Team”, so you cannot ${act}; `
      + 'an official of no team of the attempt does')
    expect(r.body.data.conflict).toEqual(['Test Team'])
    // Nothing was signed: the attempt's signatures are as they were.
    const after = await call('GET', `/api/attempts/${ids.attempt}/timing-sheet`, { cookie: event.cookie.organiser })
    expect(after.body.signatures).toEqual(before.body.signatures)
  })

  it('the same acts by an official of no team pass the check (the independent steward decides the protest)', async () => {
    const r = await call('POST', `/api/protests/${ids.protest}/decision`, {
      cookie: event.cookie.official, body: { ...decision, password: 'first-password-1', typedName: 'Test official' },
    })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
  })
})
