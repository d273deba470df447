import { createHash } from 'node:crypto'
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'
import S3rver from 's3rver'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { call, unique, useBaseUrl, useTestServer } from '../support/api'
import { clearedEntry } from '../support/entries'
import { form, pdf } from '../support/files'
import { openLiveStream } from '../support/live-stream'
import { freePort, root, startApp, type Started } from '../support/processes'
import { makeReady } from '../support/ready-attempt'
import { eventClockTime, kilometreRun, minutesAgo } from '../support/runs'
import { newTestEvent, type TestEvent } from '../support/test-event'

await useTestServer()

// Two app servers (a and b) side by side, as behind a load balancer, on an installation of their own: a database
// on the tests' PostgreSQL and one S3-compatible store (s3rver, a fake from npm). What one writes or grants, the
// other honours. This file's helpers talk to server a; each check crosses to b.
const env = JSON.parse(inject('serverEnv')) as { databaseUrl: string, dataDir: string, smtpPort: number, output: string, runDir: string }
const s3dir = mkdtempSync(join(tmpdir(), 'trapline-two-servers-s3-'))
const shared = resolve(env.runDir, 'two-servers')
let s3: S3rver
const servers: Record<'a' | 'b', Started & { base: string }> = {} as never
let event: TestEvent
const database = `trapline_cluster_${process.pid}`
const admin = new pg.Client({ connectionString: inject('databaseUrl') })
const withDatabase = (u: string) => {
  const x = new URL(u)
  x.pathname = `/${database}`
  return x.toString()
}

const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex')

beforeAll(async () => {
  // The installation's database, migrated with the app role's grants as scripts/lib.sh does.
  await admin.connect()
  await admin.query(`create database ${database}`)
  const pool = new pg.Pool({ connectionString: withDatabase(inject('databaseUrl')), max: 1 })
  await migrate(drizzle(pool), { migrationsFolder: resolve(root, 'drizzle') })
  await pool.query(readFileSync(resolve(root, 'scripts/db-grants.sql'), 'utf8'))
  await pool.end()
  s3 = new S3rver({ port: await freePort(), address: '127.0.0.1', silent: true, directory: s3dir, configureBuckets: [{ name: 'trapline-evidence', configs: [] }] })
  const { port: s3Port } = await s3.run() as unknown as { port: number }
  mkdirSync(shared, { recursive: true })
  for (const id of ['a', 'b'] as const) {
    if (id === 'b') {
      // Staging is each server's own: what a has half-received is not b's to sweep when b starts.
      writeFileSync(resolve(shared, 'uploads-tmp/a/half-received.part'), 'a')
      mkdirSync(resolve(shared, 'uploads-tmp/b'), { recursive: true })
      writeFileSync(resolve(shared, 'uploads-tmp/b/left-by-a-crash.part'), 'b')
    }
    const started = await startApp(env.output, {
      NUXT_DATABASE_URL: withDatabase(env.databaseUrl),
      NUXT_DATA_DIR: shared,
      NUXT_SERVER_ID: id,
      // The seal's key set from shared configuration: the folder the tests' server made.
      NUXT_SEAL_DIR: resolve(env.dataDir, 'seal'),
      NUXT_STORAGE_DRIVER: 's3',
      NUXT_STORAGE_S3_ENDPOINT: `http://127.0.0.1:${s3Port}`,
      NUXT_STORAGE_S3_BUCKET: 'trapline-evidence',
      NUXT_STORAGE_S3_ACCESS_KEY_ID: 'S3RVER',
      NUXT_STORAGE_S3_SECRET_ACCESS_KEY: 'S3RVER',
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_MAIL_RETRY_SECONDS: '1',
      NUXT_SEED_DEMO: 'true',
      NUXT_REQUEST_LOG: 'json',
      // Servers of the tests: periods are judged at the instant a test gives (the stewards' confirmation).
      NUXT_TEST_SERVER: 'true',
    })
    servers[id] = { ...started, base: `http://127.0.0.1:${started.port}` }
    if (id === 'a') mkdirSync(resolve(shared, 'uploads-tmp/a'), { recursive: true })
  }
  useBaseUrl(servers.a.base)
  event = await newTestEvent('intl-motorcycle', 'UTC')
}, 180_000)

afterAll(async () => {
  await Promise.all(Object.values(servers).map(s => s.stop()))
  await s3?.close().catch(() => {})
  rmSync(s3dir, { recursive: true, force: true })
  await admin.query(`drop database if exists ${database} with (force)`)
  await admin.end()
})

async function loginAt(base: string, email: string, password: string) {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }),
  })
  return { status: r.status, cookie: r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ') }
}

describe('two app servers behind one balancer', () => {
  it('are both ready (database and object store), and each sweeps only its own staging', async () => {
    for (const s of Object.values(servers)) {
      const r = await fetch(`${s.base}/api/ready`)
      expect(r.status).toBe(200)
      expect(await r.json()).toMatchObject({ ok: true, database: 'ok', storage: 'ok' })
    }
    expect(existsSync(resolve(shared, 'uploads-tmp/a/half-received.part'))).toBe(true)
    expect(existsSync(resolve(shared, 'uploads-tmp/b/left-by-a-crash.part'))).toBe(false)
  })

  it('honours on b a session made on a', async () => {
    const { status, cookie } = await loginAt(servers.a.base, event.organiserLogin[0], event.organiserLogin[1])
    expect(status).toBe(200)
    const me = await fetch(`${servers.b.base}/api/me`, { headers: { cookie } })
    expect(me.status).toBe(200)
    expect((await me.json()).user.email).toBe(event.organiserLogin[0])
  })

  it('delivers a reading written on a to live results followed on b within a second', async () => {
    const entryId = await clearedEntry(event.eventId, 'Relay Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    const start = minutesAgo(2)
    const run = await call('POST', `/api/events/${event.eventId}/runs`, {
      cookie: event.cookie.timekeeper, body: { entryId, direction: 'out', startedAt: new Date(start).toISOString() },
    })
    expect(run.status).toBe(201)
    const stream = await openLiveStream(servers.b.base, event.eventId, event.cookie.team)
    expect(stream.status).toBe(200)
    await stream.next(m => m.kind === 'full')
    const before = stream.messages.length
    const sent = Date.now()
    const written = await fetch(`${servers.a.base}/api/runs/${run.body.id}/readings`, {
      method: 'POST',
      headers: { 'cookie': event.cookie.timekeeper, 'content-type': 'application/json' },
      body: JSON.stringify({ trapId: event.traps['K-in'], systemId: event.systems.primary, time: eventClockTime(start + 60_000, 'UTC') }),
    })
    expect(written.status).toBe(201)
    // The first delta after the write (one reading may change nothing the page shows: any new version counts).
    const arrived = await stream.next(m => m.kind === 'delta', before, 5000)
    stream.close()
    expect(arrived.at - sent).toBeLessThan(1000)
  })

  it('serves from b a file uploaded through a, and seals it into a dossier built on b; its mail goes once', async () => {
    const entryId = await clearedEntry(event.eventId, 'Vault Sprite', {}, {
      team: event.cookie.team, scrutineer: event.cookie.scrutineer, scrutineerPassword: 'first-password-1',
    })
    const place = { eventId: event.eventId, timeZone: event.timeZone, timekeeper: event.cookie.timekeeper, traps: event.traps, systems: event.systems }
    // The kilometre in 8.9 s both ways (404.494 km/h, over the test event's 400.000): invented times. The runs
    // start after the inspection that cleared the machine was signed, a whole second ahead.
    const quick = { primary: [0, 8.9] as [number, number], backup: [0, 8.9] as [number, number] }
    const start = Math.ceil(Date.now() / 1000) * 1000 + 1000
    const out = await kilometreRun(place, entryId, 'out', start, quick)
    const back = await kilometreRun(place, entryId, 'back', start + 120_000, quick)
    const bytes = pdf('data log through a')
    const up = await fetch(`${servers.a.base}/api/events/${event.eventId}/evidence`, {
      method: 'POST', headers: { cookie: event.cookie.organiser }, body: form({ kind: 'other-document' }, { name: 'through-a.pdf', bytes }),
    })
    expect(up.status, await up.clone().text()).toBe(201)
    const row = await up.json()
    const down = await fetch(`${servers.b.base}/api/evidence/${row.id}/content`, { headers: { cookie: event.cookie.organiser } })
    expect(down.status).toBe(200)
    expect(sha(new Uint8Array(await down.arrayBuffer()))).toBe(sha(bytes))

    await makeReady(event, out.attemptId, [out.id, back.id], entryId, { uploadBase: servers.a.base })
    const issued = await fetch(`${servers.b.base}/api/attempts/${out.attemptId}/dossiers`, { method: 'POST', headers: { cookie: event.cookie.team } })
    expect(issued.status, await issued.clone().text()).toBe(201)
    const dossier = await issued.json()
    const file = new Uint8Array(await (await fetch(`${servers.a.base}/api/dossiers/${dossier.id}/pdf`, { headers: { cookie: event.cookie.team } })).arrayBuffer())
    const body = new FormData()
    body.append('file', new Blob([file], { type: 'application/pdf' }), 'dossier.pdf')
    const verified = await (await fetch(`${servers.b.base}/api/dossiers/verify`, { method: 'POST', body })).json()
    // Sealed on b with the certificates stored through a: b read each from the shared store.
    expect(verified.sealValid, verified.message).toBe(true)

    // Submitted on b: the officials' mail is in the shared outbox; a, b and the tests' server all try to send it.
    const submitted = await fetch(`${servers.b.base}/api/dossiers/${dossier.id}/submission`, { method: 'POST', headers: { cookie: event.cookie.team } })
    expect(submitted.status).toBe(201)
    const inboxFor = async () => ((await (await fetch(`${inject('inboxUrl')}/api/messages`)).json()) as { to: string, text: string }[])
      .filter(m => m.text.includes(dossier.pdfSha256))
    await expect.poll(async () => (await inboxFor()).length, { timeout: 15_000 }).toBeGreaterThan(0)
    await new Promise(r => setTimeout(r, 3000)) // three more rounds of every server's timer
    const mails = await inboxFor()
    const recipients = mails.map(m => m.to)
    expect(new Set(recipients).size).toBe(recipients.length) // each official once
  }, 120_000)

  it('counts a sign-in limit across both servers', async () => {
    // 10 wrong passwords per address and client in 15 min (server/utils/auth/rate-limits.ts): 5 on a, 5 on b,
    // then the next on either is refused.
    const email = unique('limit')
    for (const s of [servers.a, servers.b]) {
      for (let i = 0; i < 5; i++) expect((await loginAt(s.base, email, 'wrong-password-1')).status).toBe(401)
    }
    expect((await loginAt(servers.a.base, email, 'wrong-password-1')).status).toBe(429)
  })

  it('logs one JSON line per request with its duration, status and user id, and no secret', async () => {
    const { cookie } = await loginAt(servers.a.base, event.organiserLogin[0], event.organiserLogin[1])
    await fetch(`${servers.a.base}/api/me?token=should-not-be-logged`, { headers: { cookie } })
    await expect.poll(() => servers.a.log().includes('"path":"/api/me"')).toBe(true)
    const lines = servers.a.log().split('\n').filter(l => l.startsWith('{"t":'))
    const me = lines.map(l => JSON.parse(l)).find(l => l.path === '/api/me' && l.status === 200)
    expect(me).toMatchObject({ server: 'a', method: 'GET', status: 200 })
    expect(typeof me.ms).toBe('number')
    expect(typeof me.user).toBe('number')
    expect(servers.a.log()).not.toMatch(/should-not-be-logged|organiser-password-1|first-password-1|wrong-password-1/)
  })

  it('is not ready while its object store is down, and says which', async () => {
    await s3.close()
    const r = await fetch(`${servers.b.base}/api/ready`)
    expect(r.status).toBe(503)
    const body = await r.json()
    expect(body).toMatchObject({ ok: false, database: 'ok' })
    expect(body.storage).toMatch(/^unreachable/)
    expect((await fetch(`${servers.b.base}/api/alive`)).status).toBe(200)
  })
})
