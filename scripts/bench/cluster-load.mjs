// Two app servers on one PostgreSQL: 500 clients follow the demo event's live results, split evenly over
// both; a write (in PostgreSQL, as either server's would be) is timed until every client has it, five times;
// the CPU each server spent meanwhile, from /proc. Then an upload through each server at once.
import { execFileSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'

const { values } = parseArgs({ options: {
  a: { type: 'string' }, b: { type: 'string' }, pids: { type: 'string' }, db: { type: 'string' }, psql: { type: 'string' },
  clients: { type: 'string', default: '500' }, uploadMb: { type: 'string', default: '200' },
} })
const urls = [values.a, values.b]
const pids = values.pids.split(',')
const sql = q => execFileSync(values.psql, [values.db, '-tAc', q], { encoding: 'utf8' }).trim()
const pct = (s, p) => s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))]
const ticks = () => pids.map(pid => readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ').slice(11, 13).reduce((t, x) => t + Number(x), 0))
const HZ = 100 // USER_HZ on Linux

async function login(url) {
  const r = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'team@trapline.test', password: 'trapline-demo' }) })
  if (!r.ok) throw new Error(`sign-in failed: ${r.status}`)
  return r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}
const cookie = await login(urls[0])
const eventId = Number(sql(`select id from events order by id limit 1`))

const arrivals = []
let waiting = null
const clients = Number(values.clients)
const controllers = await Promise.all(Array.from({ length: clients }, async (_, i) => {
  const controller = new AbortController()
  const r = await fetch(`${urls[i % 2]}/api/events/${eventId}/live-stream`, { headers: { cookie }, signal: controller.signal })
  const reader = r.body.pipeThrough(new TextDecoderStream()).getReader()
  ;(async () => {
    let buffer = ''
    for (;;) {
      const { value, done } = await reader.read()
      if (done) return
      buffer += value
      for (let j = buffer.indexOf('\n\n'); j >= 0; j = buffer.indexOf('\n\n')) {
        const block = buffer.slice(0, j)
        buffer = buffer.slice(j + 2)
        const data = block.split('\n').find(l => l.startsWith('data:'))
        if (data && JSON.parse(data.slice(5)).kind === 'delta' && waiting) {
          arrivals.push({ ms: performance.now() - waiting.t, server: i % 2 })
          if (arrivals.length === clients) waiting.done()
        }
      }
    }
  })().catch(() => {})
  return controller
}))
await new Promise(r => setTimeout(r, 2000))
const run = sql(`select max(id) from runs where event_id = ${eventId}`)
const cpuBefore = ticks()
const started = performance.now()
const rounds = []
for (let i = 0; i < 5; i++) {
  arrivals.length = 0
  const done = new Promise((resolve) => {
    waiting = { t: performance.now(), done: resolve }
  })
  sql(`insert into weather (run_id, wind_speed_ms, wind_from_deg, entered_by) values (${run}, ${1 + i / 10}, 90, (select id from users limit 1))`)
  await Promise.race([done, new Promise(r => setTimeout(r, 15_000))])
  waiting = null
  const ms = arrivals.map(a => a.ms).sort((x, y) => x - y)
  rounds.push({ received: ms.length, p50: pct(ms, 50), p95: pct(ms, 95), last: ms.at(-1) })
  await new Promise(r => setTimeout(r, 500))
}
const seconds = (performance.now() - started) / 1000
const cpu = ticks().map((t, i) => ((t - cpuBefore[i]) / HZ / seconds) * 100)
controllers.forEach(c => c.abort())
console.log(`${clients} clients following live results, ${clients / 2} on each server; a write reaching all of them:`)
for (const [i, r] of rounds.entries()) {
  console.log(`  round ${i + 1}: ${r.received}/${clients} received, p50 ${r.p50?.toFixed(0)} ms, p95 ${r.p95?.toFixed(0)} ms, last ${r.last?.toFixed(0)} ms`)
}
console.log(`  CPU over those ${seconds.toFixed(1)} s: server a ${cpu[0].toFixed(1)} %, server b ${cpu[1].toFixed(1)} % of one core`)

// An upload through each server at once: a video of the streamliner's first run (an MP4 header, then zeros).
const mb = Number(values.uploadMb)
const bytes = Buffer.alloc(mb * 1024 * 1024, 0)
Buffer.from('\x00\x00\x00\x18ftypmp42\x00\x00\x00\x00mp42isom', 'latin1').copy(bytes)
const runId = sql(`select r.id from runs r join attempts a on a.id = r.attempt_id join entries e on e.id = a.entry_id
  join teams t on t.id = e.team_id where t.name = 'Larkspur Works' order by r.id limit 1`)
const t0 = performance.now()
const results = await Promise.all(urls.map(async (url, i) => {
  const form = new FormData()
  form.append('kind', 'video')
  form.append('runId', runId)
  form.append('file', new Blob([bytes.subarray(0, bytes.length - i)], { type: 'video/mp4' }), `bench-${i}.mp4`)
  const t = performance.now()
  const r = await fetch(`${url}/api/events/${eventId}/evidence`, { method: 'POST', headers: { cookie }, body: form })
  await r.arrayBuffer()
  return { status: r.status, s: (performance.now() - t) / 1000 }
}))
const wall = (performance.now() - t0) / 1000
console.log(`two uploads of ${mb} MB at once, one through each server: ${results.map((r, i) => `${'ab'[i]} ${r.status} in ${r.s.toFixed(1)} s`).join(', ')}; `
  + `${((2 * mb) / wall).toFixed(0)} MB/s together`)
