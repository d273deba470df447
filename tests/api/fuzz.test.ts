import fc from 'fast-check'
import pg from 'pg'
import { beforeAll, expect, inject, it } from 'vitest'
import { call, demoEmail, login, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { kilometreRun, minutesAgo } from '../support/runs'
import { routeFiles } from '../support/routes'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Every route, as every kind of identity, with bodies and ids made by fast-check (a general-purpose
// property-testing library from npm): huge, empty, of the wrong type, with NUL and other unicode,
// negative, beyond the database's range, with duplicate keys. No answer may be a 500, and a refused
// request writes nothing. Writes that pass go to an event of this test's own.
let event: TestEvent
let ids: Record<string, number>
const cookies: Record<string, string> = {}

beforeAll(async () => {
  event = await newTestEvent('intl-motorcycle', 'UTC')
  const entryId = await clearedEntry(event.eventId, 'Fuzz Runner', {}, {
    team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
  })
  const run = await kilometreRun({ ...event, timekeeper: event.cookie.timekeeper }, entryId, 'out', minutesAgo(5), { primary: [0, 9], backup: [0, 9] })
  const owner = new pg.Client({ connectionString: inject('databaseUrl') })
  await owner.connect()
  const one = async (q: string) => (await owner.query(q, [event.eventId])).rows[0]?.id ?? 1
  ids = {
    event: event.eventId,
    run: run.id,
    attempt: run.attemptId,
    reading: await one('select x.id from readings x join runs r on r.id = x.run_id where r.event_id = $1 limit 1'),
    inspection: await one('select id from inspections where event_id = $1 limit 1'),
    signature: await one('select id from signatures where event_id = $1 limit 1'),
    machine: await one('select machine_id as id from entries where event_id = $1 limit 1'),
    checklist: await one('select id from checklists where event_id = $1 limit 1'),
  }
  await owner.end()
  Object.assign(cookies, event.cookie, { anonymous: '', admin: await login(demoEmail('admin')) })
})

const text = fc.oneof(
  fc.string(),
  fc.string({ unit: 'grapheme' }),
  fc.constantFrom('', '\u0000', 'a\u0000b', '𝔗𝔯𝔞𝔭', '\u202e', '../../etc/passwd', '<script>', '1e400', '-1', 'NaN'),
  fc.constant('9'.repeat(5000)),
)
const number = fc.oneof(fc.integer(), fc.double(), fc.constantFrom(0, -1, 2 ** 31, 2 ** 53, 1e308, -1e308))
const leaf = fc.oneof(text, number, fc.boolean(), fc.constant(null))
const FIELDS = ['id', 'entryId', 'attemptId', 'runId', 'trapId', 'systemId', 'direction', 'startedAt', 'time', 'reason',
  'password', 'typedName', 'email', 'name', 'role', 'kind', 'code', 'speed', 'unit', 'csv', 'columns', 'profile', 'runs',
  'distanceM', 'elapsedS', 'checkedInAt', 'decision', 'reasons', 'items', 'value', 'note', 'timeZone', 'everywhere']
const body = fc.oneof(
  fc.dictionary(fc.constantFrom(...FIELDS), fc.oneof(leaf, fc.array(leaf, { maxLength: 3 }), fc.dictionary(fc.constantFrom(...FIELDS), leaf, { maxKeys: 3 })), { maxKeys: 6 }),
  fc.array(leaf, { maxLength: 4 }),
  leaf,
)
const OWNER: Record<string, string> = { runs: 'run', readings: 'reading', attempts: 'attempt', inspections: 'inspection', signatures: 'signature', statements: 'signature', evidence: 'reading', dossiers: 'attempt', machines: 'machine', checklists: 'checklist' }

it('answers every route, as anyone, with anything, and never with a 500', { timeout: 240_000 }, async () => {
  const seen: string[] = []
  for (const route of routeFiles()) {
    const [method, path] = route.split(' ') as [string, string]
    const owner = /^\/api\/([a-z-]+)\/\[id\]/.exec(path)?.[1]
    const goodId = owner === 'events' ? ids.event : ids[OWNER[owner ?? ''] ?? 'event'] ?? 1
    const pathId = fc.oneof(fc.constant(String(goodId)), fc.constantFrom('0', '-1', '2147483648', 'abc', '1e400', '%00', '9'.repeat(30)))
    // The demo administrator is shared with the other test files: it stays out of the routes that end sessions.
    const who = fc.constantFrom(...Object.keys(cookies).filter(w => !(w === 'admin' && path.startsWith('/api/auth'))))
    await fc.assert(fc.asyncProperty(who, pathId, body, fc.boolean(), async (w, id, b, duplicate) => {
      const url = path.replace('[id]', id).replace('[sha]', 'a'.repeat(64))
      let raw = method === 'GET' ? undefined : JSON.stringify(b)
      // A duplicate key: JSON allows it, the last one wins; it must not confuse a check made on the first.
      if (raw && duplicate && raw.startsWith('{"')) raw = `{"id":1,${raw.slice(1)}`.replace(/,}$/, '}')
      const r = await call(method, url, { cookie: cookies[w], ...(raw === undefined ? {} : { raw }) })
      seen.push(`${r.status}`)
      expect(r.status, `${method} ${url} as ${w} with ${raw?.slice(0, 200)} → ${JSON.stringify(r.body)?.slice(0, 300)}`).toBeLessThan(500)
    }), { numRuns: 6, seed: Number(process.env.FUZZ_SEED ?? 0) || undefined })
  }
  expect(seen.length).toBeGreaterThan(100)
  // What was written is whole: the event's day still computes, as its organiser sees it.
  const fresh = await login(...event.organiserLogin)
  for (const tail of ['live', 'run-sheet', 'setup']) {
    expect((await call('GET', `/api/events/${event.eventId}/${tail}`, { cookie: fresh })).status).toBe(200)
  }
})
