// npm run restore -- trapline-backup.tar.gz
// Brings a backup (npm run backup) into an empty installation: the database restored with pg_restore, the
// app's grants applied, and every object put back in the disk store after its SHA-256 is checked (with an
// S3-compatible store, each listed object must already be in the bucket). Refuses a database with tables.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { copyFileSync, createReadStream, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import pg from 'pg'
import { objectPath, ownerDatabaseUrl, pgTool, ROOT, storageDriver } from './backup-lib.mjs'

const archive = process.argv[2]
if (!archive || !existsSync(archive)) {
  console.error('usage: npm run restore -- trapline-backup.tar.gz (into an empty installation)')
  process.exit(2)
}
const url = ownerDatabaseUrl()
const work = mkdtempSync(join(tmpdir(), 'trapline-restore-'))
const sha256Of = path => new Promise((ok, fail) => {
  const h = createHash('sha256')
  createReadStream(path).on('data', d => h.update(d)).on('end', () => ok(h.digest('hex'))).on('error', fail)
})

const client = new pg.Client({ connectionString: url })
await client.connect()
try {
  const tar = spawnSync('tar', ['-xzf', resolve(archive), '-C', work], { encoding: 'utf8' })
  if (tar.status !== 0) throw new Error(`tar failed: ${tar.stderr}`)
  const dir = join(work, 'trapline-backup')
  const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8'))
  if (manifest.format !== 'trapline-backup/1') throw new Error(`not a Trapline backup: ${manifest.format}`)
  const { rows: [{ n }] } = await client.query(
    `select count(*)::int as n from information_schema.tables where table_schema in ('public', 'drizzle')`)
  if (n > 0) throw new Error('the database is not empty: a restore goes into an empty installation, never over one')

  // Objects first (checked by hash), then the database that refers to them.
  let placed = 0
  for (const o of manifest.storage.objects) {
    if (!o.included) continue
    const from = join(dir, 'objects', o.sha256)
    if (await sha256Of(from) !== o.sha256) throw new Error(`object ${o.sha256} in the archive does not match its hash`)
    if (storageDriver() !== 'local') throw new Error('this archive holds disk-store objects: restore with NUXT_STORAGE_DRIVER=local')
    const to = objectPath(o.sha256)
    mkdirSync(dirname(to), { recursive: true })
    copyFileSync(from, to)
    placed++
  }
  const restore = spawnSync(pgTool('pg_restore'), ['--no-owner', '--no-privileges', '--exit-on-error', '--dbname', url, join(dir, 'database.dump')], { encoding: 'utf8' })
  if (restore.status !== 0) throw new Error(`pg_restore failed: ${restore.stderr}`)
  const role = await client.query(`select 1 from pg_roles where rolname = 'trapline_app'`)
  if (role.rows.length) await client.query(readFileSync(join(ROOT, 'scripts/db-grants.sql'), 'utf8'))
  else console.log('[restore] no role trapline_app here yet: apply scripts/db-grants.sql once it exists')
  console.log(`[restore] the database and ${placed} object(s) from ${archive}`)
}
finally {
  await client.end()
  rmSync(work, { recursive: true, force: true })
}
