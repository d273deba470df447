// 50 clients poll GET /api/events/:id/live for a fixed time; prints p50/p95 latency, requests per
// second, and SQL statements per request (from PostgreSQL's own commit counter), for an event with
// 20 runs and one with 200 runs, so that a count growing with the runs would show. Then 200 streams of
// pushed results held open, and how long a write takes to reach every one of them.
import { execFileSync } from 'node:child_process'
import { parseArgs } from 'node:util'

const { values } = parseArgs({ options: { url: { type: 'string' }, db: { type: 'string' }, psql: { type: 'string' }, clients: { type: 'string', default: '50' }, seconds: { type: 'string', default: '10' }, streams: { type: 'string', default: '200' } } })
const sql = q => execFileSync(values.psql, [values.db, '-tAc', q], { encoding: 'utf8' }).trim()

/** An event of its own; seedRuns gives it N runs of 5 traps × 2 timing systems = 10 readings each. */
function seedEvent(name) {
  return Number(sql(`
    with ev as (insert into events (name, venue, starts_on, ends_on, time_zone, profile_id, profile)
      select '${name}', 'bench course', starts_on, ends_on, time_zone, profile_id, profile from events order by id limit 1 returning id, profile),
    c as (insert into courses (event_id, name, heading_deg, surface) select id, 'bench', 0, 'clay' from ev returning id, event_id),
    t as (insert into traps (course_id, label, position_m, elevation_m) select c.id, 'T' || g, 1000 + (g - 1) * 402.336, 1000 from c, generate_series(1, 5) g returning id, course_id, position_m),
    d as (insert into measured_distances (course_id, label, start, nominal_m, entry_trap_id, exit_trap_id)
      select c.id, 'Flying mile', 'flying', 1609.344, (select id from t where position_m = 1000), (select id from t where position_m = 2609.344) from c returning id),
    s as (insert into timing_systems (event_id, name, role, ticks_per_second, tolerance_s, calibrated_on, calibration_expires)
      select ev.id, r, r::system_role, 10000, 0.002, '2026-01-01', '2027-01-01' from ev, unnest(array['primary', 'backup']) r returning id, event_id),
    tm as (insert into teams (event_id, name) select id, 'Bench team' from ev returning id, event_id),
    m as (insert into machines (team_id, name, power, declared_mass_kg, division) select id, 'Bench machine', 'electric', 250, 'full' from tm returning id, team_id),
    rd as (insert into riders (team_id, name, licence_no, licence_expires) select id, 'Bench rider', 'B-1', '2027-01-01' from tm returning id),
    e as (insert into entries (event_id, team_id, machine_id, rider_id, class_name, distance_id, distance_ids) select tm.event_id, tm.id, m.id, rd.id, 'bench', d.id, array[d.id] from tm, m, rd, d returning id, event_id),
    mem as (insert into memberships (event_id, user_id, role) select ev.id, u.id, 'timekeeper' from ev, users u where u.email = 'timekeeper@trapline.test' returning 1)
    select id from ev`))
}

function seedRuns(eventId, runs) {
  sql(`
    do $$ declare a int; r int; i int; begin
      for i in 1..${runs / 2} loop
        insert into attempts (event_id, entry_id, profile) select e.event_id, e.id, ev.profile from entries e join events ev on ev.id = e.event_id where e.event_id = ${eventId} returning id into a;
        for r in 0..1 loop
          insert into runs (event_id, attempt_id, direction, started_at, status, created_by)
            values (${eventId}, a, (case when r = 0 then 'out' else 'back' end)::run_direction, now() - interval '1 hour' * (${runs} - i) + interval '30 minutes' * r, 'finished', (select id from users limit 1)) returning id into r;
          insert into readings (run_id, trap_id, system_id, ticks, entered_by)
            select r, t.id, s.id, 360000000 + round((t.position_m - 1000) / 111.1 * 10000)::bigint + case when s.role = 'backup' then 3 else 0 end, (select id from users limit 1)
            from traps t join courses c on c.id = t.course_id, timing_systems s where c.event_id = ${eventId} and s.event_id = ${eventId};
        end loop;
      end loop;
    end $$;`)
}

async function login() {
  const r = await fetch(`${values.url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'timekeeper@trapline.test', password: 'trapline-demo' }) })
  if (!r.ok) throw new Error(`sign-in failed: ${r.status}`)
  return r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

const pct = (sorted, p) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]

/**
 * mode 'full': every request downloads the whole results (as with no cache at all);
 * mode 'revalidate': each client sends If-None-Match as a browser does, so unchanged polls are 304;
 * mode 'paced': each client polls once a second (the page polls every 3 s), full downloads.
 */
async function load(eventId, cookie, mode) {
  const clients = Number(values.clients)
  const until = Date.now() + Number(values.seconds) * 1000
  const latencies = []
  let errors = 0
  const commits = () => Number(sql(`select xact_commit from pg_stat_database where datname = current_database()`))
  sql('select pg_stat_clear_snapshot()')
  const before = commits()
  const started = Date.now()
  await Promise.all(Array.from({ length: clients }, async () => {
    let etag = ''
    if (mode === 'paced') await new Promise(r => setTimeout(r, Math.random() * 1000))
    while (Date.now() < until) {
      const t = performance.now()
      const headers = mode === 'revalidate' && etag ? { cookie, 'if-none-match': etag } : { cookie }
      const r = await fetch(`${values.url}/api/events/${eventId}/live`, { headers })
      await r.arrayBuffer()
      if (r.ok || r.status === 304) latencies.push(performance.now() - t)
      else errors++
      etag = r.headers.get('etag') ?? etag
      if (mode === 'paced') await new Promise(r => setTimeout(r, Math.max(0, 1000 - (performance.now() - t))))
    }
  }))
  const elapsed = (Date.now() - started) / 1000
  await new Promise(r => setTimeout(r, 600)) // statistics are flushed to the view every 500 ms
  const statements = commits() - before
  latencies.sort((a, b) => a - b)
  return { requests: latencies.length, errors, rps: latencies.length / elapsed, p50: pct(latencies, 50), p95: pct(latencies, 95), perRequest: statements / Math.max(1, latencies.length + errors) }
}

/** Opens a stream of live results; resolves each message's arrival (and its size) to `onMessage`. */
async function openStream(eventId, cookie, onMessage) {
  const controller = new AbortController()
  const r = await fetch(`${values.url}/api/events/${eventId}/live-stream`, { headers: { cookie }, signal: controller.signal })
  const reader = r.body.pipeThrough(new TextDecoderStream()).getReader()
  ;(async () => {
    let buffer = ''
    for (;;) {
      const { value, done } = await reader.read()
      if (done) return
      buffer += value
      for (let i = buffer.indexOf('\n\n'); i >= 0; i = buffer.indexOf('\n\n')) {
        const block = buffer.slice(0, i)
        buffer = buffer.slice(i + 2)
        const data = block.split('\n').find(l => l.startsWith('data:'))
        if (data) onMessage(JSON.parse(data.slice(5)), Buffer.byteLength(block))
      }
    }
  })().catch(() => {})
  return () => controller.abort()
}

/**
 * `clients` streams held open on the event; then a weather reading is written (in PostgreSQL, as any app
 * server's write would be) and the time until every client has the change is measured, five times.
 */
async function pushed(eventId, cookie, clients) {
  let fullBytes = 0
  let deltaBytes = 0
  const arrivals = []
  let waiting = null
  const closers = await Promise.all(Array.from({ length: clients }, () => openStream(eventId, cookie, (msg, size) => {
    if (msg.kind === 'full') fullBytes = size
    if (msg.kind === 'delta' && waiting) {
      deltaBytes = size
      arrivals.push(performance.now() - waiting.t)
      if (arrivals.length === clients) waiting.done()
    }
  })))
  await new Promise(r => setTimeout(r, 1000))
  const lastRun = sql(`select max(id) from runs where event_id = ${eventId}`)
  const rounds = []
  for (let i = 0; i < 5; i++) {
    arrivals.length = 0
    const done = new Promise((resolve) => {
      waiting = { t: performance.now(), done: resolve }
    })
    sql(`insert into weather (run_id, wind_speed_ms, wind_from_deg, entered_by) values (${lastRun}, ${1 + i / 10}, 90, (select id from users limit 1))`)
    await Promise.race([done, new Promise(r => setTimeout(r, 10_000))])
    waiting = null
    arrivals.sort((a, b) => a - b)
    rounds.push({ received: arrivals.length, last: arrivals.at(-1) ?? Infinity, p50: pct(arrivals, 50) ?? Infinity })
    await new Promise(r => setTimeout(r, 300))
  }
  closers.forEach(close => close())
  return { fullBytes, deltaBytes, rounds }
}

const cookie = await login()
for (const runs of [20, 200]) {
  const id = seedEvent(`Bench ${runs}`)
  seedRuns(id, runs)
  const readings = sql(`select count(*) from readings x join runs r on r.id = x.run_id where r.event_id = ${id}`)
  // Warm up, then measure.
  for (let i = 0; i < 20; i++) await (await fetch(`${values.url}/api/events/${id}/live`, { headers: { cookie } })).arrayBuffer()
  const bytes = (await (await fetch(`${values.url}/api/events/${id}/live`, { headers: { cookie } })).arrayBuffer()).byteLength
  for (const mode of ['paced', 'revalidate', 'full']) {
    const r = await load(id, cookie, mode)
    console.log(`live results, ${runs} runs, ${readings} readings, ${(bytes / 1024).toFixed(0)} KiB, ${values.clients} clients ${mode}, ${values.seconds} s: `
      + `${r.requests} requests (${r.errors} errors), ${r.rps.toFixed(1)} req/s, p50 ${r.p50.toFixed(1)} ms, p95 ${r.p95.toFixed(1)} ms, `
      + `${r.perRequest.toFixed(2)} SQL statements per request`)
  }
  const streams = Number(values.streams)
  const p = await pushed(id, cookie, streams)
  const worst = Math.max(...p.rounds.map(r => r.last))
  console.log(`pushed live results, ${runs} runs, ${streams} open streams: first message ${(p.fullBytes / 1024).toFixed(0)} KiB, `
    + `a change ${(p.deltaBytes / 1024).toFixed(1)} KiB; a write reached every client in `
    + `${p.rounds.map(r => `${r.last.toFixed(0)} ms (${r.received}/${streams}, p50 ${r.p50.toFixed(0)} ms)`).join(', ')}; `
    + `worst ${worst.toFixed(0)} ms ${worst < 1000 ? '(within 1 s)' : '(OVER 1 s)'}`)
}
