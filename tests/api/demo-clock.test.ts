import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { addDays } from '#shared/rules/zoned'
import { startApp, root, type Started } from '../support/processes'
import { DEMO_EVENT_NAME, DEMO_PASSWORD } from '../support/api'

// The demo seeded two years from today, on a database and server of its own: every date of the
// demo follows from the seeding day, so its day is still complete then (nothing expires with time).
const today = new Date().toISOString().slice(0, 10)
const twoYearsAhead = addDays(today, 730)
const database = `trapline_clock_${process.pid}`
const admin = new pg.Client({ connectionString: inject('databaseUrl') })
let app: Started
let base = ''

beforeAll(async () => {
  await admin.connect()
  await admin.query(`create database ${database}`)
  const url = new URL(inject('databaseUrl'))
  url.pathname = `/${database}`
  const pool = new pg.Pool({ connectionString: url.toString(), max: 1 })
  await migrate(drizzle(pool), { migrationsFolder: resolve(root, 'drizzle') })
  await pool.query(readFileSync(resolve(root, 'scripts/db-grants.sql'), 'utf8')) // as scripts/lib.sh does
  await pool.end()
  const env = JSON.parse(inject('serverEnv'))
  const appUrl = new URL(env.databaseUrl)
  appUrl.pathname = `/${database}`
  app = await startApp(env.output, {
    NUXT_DATABASE_URL: appUrl.toString(),
    NUXT_DATA_DIR: resolve(env.runDir, 'clock-storage'),
    NUXT_MAIL_PORT: String(env.smtpPort),
    NUXT_SEED_DEMO: 'true',
    NUXT_DEMO_TODAY: twoYearsAhead,
  })
  base = `http://127.0.0.1:${app.port}`
})

afterAll(async () => {
  await app?.stop()
  await admin.query(`drop database if exists ${database} with (force)`)
  await admin.end()
})

async function signIn(email: string) {
  const r = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  })
  expect(r.status).toBe(200)
  return r.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
}

describe('the demo seeded two years ahead', () => {
  it('has its runs on the day before the seeding day and a complete, ratified day', async () => {
    // The seed seals, submits and ratifies the streamliner's dossiers (the mile and the kilometre of one pair)
    // only when nothing is missing; the two ratified records in the book show that it did.
    await expect.poll(async () => (await (await fetch(`${base}/api/record-book`)).json()).records.length, { timeout: 30_000 })
      .toBe(2)
    const team = await signIn('team@trapline.test')
    const events = await (await fetch(`${base}/api/events`, { headers: { cookie: team } })).json() as any[]
    const event = events.find(e => e.name === DEMO_EVENT_NAME)
    const live = await (await fetch(`${base}/api/events/${event.id}/live`, { headers: { cookie: team } })).json() as any[]
    const pair = live.find(a => a.entry.machineName === 'Larkspur Fennwick streamliner')
    // Runs at 08:05 and 08:52 in America/Denver (UTC−6 in summer, UTC−7 in winter) on the day before.
    expect(pair.runs.map((r: any) => r.startedAt.slice(0, 10))).toEqual([addDays(twoYearsAhead, -1), addDays(twoYearsAhead, -1)])
    const readiness = await (await fetch(`${base}/api/attempts/${pair.id}/readiness`, { headers: { cookie: team } })).json() as any
    expect(readiness.items.filter((i: any) => !i.met).map((i: any) => i.key)).toEqual([])
    expect(readiness.items.map((i: any) => i.key)).toEqual(expect.arrayContaining(['licence', 'calibration-primary', 'calibration-backup']))
  })
})
