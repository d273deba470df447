import { resolve } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, expect, inject, it } from 'vitest'
import { useTestServer } from '../support/api'
import { startApp, type Started } from '../support/processes'

await useTestServer()
const db = new pg.Client({ connectionString: inject('databaseUrl') })
const extra: Started[] = []

beforeAll(async () => {
  await db.connect()
  const env = JSON.parse(inject('serverEnv'))
  // Two more app servers on the same database, each with its own retry timer every second (as the test server).
  for (const n of [1, 2]) {
    extra.push(await startApp(env.output, {
      NUXT_DATABASE_URL: env.databaseUrl,
      NUXT_DATA_DIR: resolve(env.runDir, `outbox-server-${n}`),
      NUXT_SEAL_DIR: resolve(env.dataDir, 'seal'), // the seal's key set is shared by every server
      NUXT_MAIL_PORT: String(env.smtpPort),
      NUXT_MAIL_RETRY_SECONDS: '1',
      NUXT_SEED_DEMO: 'true', // the database holds the demo: already seeded, so nothing is added
    }))
  }
})

afterAll(async () => {
  await Promise.all(extra.map(s => s.stop()))
  await db.end()
})

it('sends each outbox message exactly once with three app servers retrying at once', async () => {
  const tag = `once-${process.pid}-${Date.now()}`
  const count = 40
  // Pending mail as a failed first attempt leaves it: every server's timer sees it at the same moment.
  await db.query(
    `insert into mail_outbox ("to", subject, text, tries, last_error)
     select 'outbox@example.test', $1 || ' #' || g, 'body', 1, 'connection refused' from generate_series(1, $2) g`,
    [tag, count],
  )
  const pending = async () => Number((await db.query('select count(*) from mail_outbox where sent_at is null and subject like $1', [`${tag}%`])).rows[0].count)
  await expect.poll(pending, { timeout: 20_000, interval: 200 }).toBe(0)
  const inbox = await (await fetch(`${inject('inboxUrl')}/api/messages`)).json() as { subject: string }[]
  const mine = inbox.filter(m => m.subject.startsWith(tag)).map(m => m.subject)
  expect(mine.length).toBe(count)
  expect(new Set(mine).size).toBe(count)
})
