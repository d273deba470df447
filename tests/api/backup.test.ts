import { execFileSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { existsSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, expect, inject, it } from 'vitest'
import { useTestServer } from '../support/api'
import { root, startApp, type Started } from '../support/processes'

await useTestServer()

// npm run backup of the tests' installation (every dossier and file the tests made so far), then npm run restore
// into an empty database and data folder, and a server started on what was restored: every dossier still
// verifies and every evidence file still matches its hash.
const env = JSON.parse(inject('serverEnv')) as { databaseUrl: string, dataDir: string, smtpPort: number, output: string, runDir: string }
const database = `trapline_restore_${process.pid}`
const restoredData = resolve(env.runDir, 'restored-storage')
const archive = resolve(env.runDir, 'backup.tar.gz')
const admin = new pg.Client({ connectionString: inject('databaseUrl') })
const restoredUrl = (() => {
  const u = new URL(inject('databaseUrl'))
  u.pathname = `/${database}`
  return u.toString()
})()
let app: Started

beforeAll(async () => {
  await admin.connect()
  await admin.query(`create database ${database}`)
}, 60_000)

afterAll(async () => {
  await app?.stop()
  await admin.query(`drop database if exists ${database} with (force)`)
  await admin.end()
})

const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex')
const run = (script: string, args: string[], vars: Record<string, string>) =>
  execFileSync(process.execPath, [join(root, 'scripts', script), ...args], { cwd: root, env: { ...process.env, ...vars }, encoding: 'utf8' })

it('backs up the installation and restores it into an empty one, where every dossier verifies and every file matches', async () => {
  const made = run('backup.mjs', ['--out', archive], { DATABASE_URL: inject('databaseUrl'), NUXT_DATA_DIR: env.dataDir })
  expect(made).toMatch(/the database and \d+ object\(s\)/)
  expect(existsSync(archive)).toBe(true)

  // A restore refuses a database that is not empty (the tests' own), touching nothing.
  expect(() => run('restore.mjs', [archive], { DATABASE_URL: inject('databaseUrl'), NUXT_DATA_DIR: restoredData }))
    .toThrow(/not empty/)
  const restored = run('restore.mjs', [archive], { DATABASE_URL: restoredUrl, NUXT_DATA_DIR: restoredData })
  expect(restored).toMatch(/the database and \d+ object\(s\)/)

  const db = new pg.Client({ connectionString: restoredUrl })
  await db.connect()
  const evidence = (await db.query('select sha256 from evidence')).rows as { sha256: string }[]
  const dossiers = (await db.query('select id, pdf_sha256 from dossiers order by id')).rows as { id: number, pdf_sha256: string }[]
  await db.end()
  expect(evidence.length).toBeGreaterThan(0)
  expect(dossiers.length).toBeGreaterThan(0)
  const stored = (s: string) => readFileSync(join(restoredData, 'evidence', s.slice(0, 2), s))
  for (const e of evidence) expect(sha(stored(e.sha256)), e.sha256).toBe(e.sha256)

  // The restored installation runs, with the seal's keys from their own (shared) folder, and checks each dossier.
  const appUrl = new URL(env.databaseUrl)
  appUrl.pathname = `/${database}`
  app = await startApp(env.output, {
    NUXT_DATABASE_URL: appUrl.toString(),
    NUXT_DATA_DIR: restoredData,
    NUXT_SEAL_DIR: resolve(env.dataDir, 'seal'),
    NUXT_MAIL_PORT: String(env.smtpPort),
    NUXT_SEED_DEMO: 'true',
  })
  const base = `http://127.0.0.1:${app.port}`
  for (const d of dossiers) {
    const body = new FormData()
    body.append('file', new Blob([stored(d.pdf_sha256)], { type: 'application/pdf' }), `dossier-${d.id}.pdf`)
    // The public check allows 60 a minute per client: past that it says when to come back.
    let r = await fetch(`${base}/api/dossiers/verify`, { method: 'POST', body })
    while (r.status === 429 || r.status === 503) {
      await new Promise(ok => setTimeout(ok, 1000 * Number(r.headers.get('retry-after') ?? 5)))
      r = await fetch(`${base}/api/dossiers/verify`, { method: 'POST', body })
    }
    const report = await r.json()
    expect(report.sealValid, `dossier #${d.id}: ${report.message}`).toBe(true)
  }
}, 300_000)
