// npm run backup [-- --out trapline-backup.tar.gz]
// A consistent archive of an installation: the database (pg_dump, custom format) and a manifest of every
// evidence object and dossier PDF by SHA-256, all read in one snapshot of the database; with the disk store,
// the objects themselves (with an S3-compatible store they stay in the bucket: back it up with its provider's
// versioning or replication). The seal's private keys are not in it: keep them apart, as the secret they are.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { copyFileSync, createReadStream, existsSync, mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { basename, join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import pg from 'pg'
import { objectPath, ownerDatabaseUrl, pgTool, storageDriver } from './backup-lib.mjs'

const { values } = parseArgs({ options: { out: { type: 'string' } } })
const stamp = new Date().toISOString().replace(/[:.]/g, '-')
const out = resolve(values.out ?? `trapline-backup-${stamp}.tar.gz`)
const url = ownerDatabaseUrl()
const work = mkdtempSync(join(tmpdir(), 'trapline-backup-'))
const dir = join(work, 'trapline-backup')
mkdirSync(join(dir, 'objects'), { recursive: true })

const sha256Of = path => new Promise((ok, fail) => {
  const h = createHash('sha256')
  createReadStream(path).on('data', d => h.update(d)).on('end', () => ok(h.digest('hex'))).on('error', fail)
})

const client = new pg.Client({ connectionString: url })
await client.connect()
try {
  // One snapshot for the list of objects and the dump: nothing written meanwhile is half in the archive.
  await client.query('begin isolation level repeatable read read only')
  const { rows: [{ snapshot }] } = await client.query('select pg_export_snapshot() as snapshot')
  const { rows } = await client.query(`
    select sha256 as sha, 'evidence' as kind from evidence
    union select pdf_sha256, 'dossier' from dossiers
    union select public_pdf_sha256, 'dossier' from dossiers where public_pdf_sha256 is not null`)
  const dump = spawnSync(pgTool('pg_dump'), ['--format=custom', `--snapshot=${snapshot}`, '--file', join(dir, 'database.dump'), '--dbname', url], { encoding: 'utf8' })
  if (dump.status !== 0) throw new Error(`pg_dump failed: ${dump.stderr}`)
  await client.query('commit')

  const shas = [...new Set(rows.map(r => r.sha))].sort()
  const objects = []
  const local = storageDriver() === 'local'
  for (const sha of shas) {
    if (!local) {
      objects.push({ sha256: sha, included: false })
      continue
    }
    const from = objectPath(sha)
    if (!existsSync(from)) throw new Error(`object ${sha} is in the database but not in the store at ${from}`)
    if (await sha256Of(from) !== sha) throw new Error(`object ${sha} in the store does not match its hash`)
    copyFileSync(from, join(dir, 'objects', sha))
    objects.push({ sha256: sha, bytes: statSync(from).size, included: true })
  }
  const manifest = {
    format: 'trapline-backup/1',
    createdAt: new Date().toISOString(),
    database: { file: 'database.dump', format: 'pg_dump custom', snapshot },
    storage: { driver: storageDriver(), objects },
  }
  writeFileSync(join(dir, 'manifest.json'), `${JSON.stringify(manifest, null, 2)}\n`)
  const tar = spawnSync('tar', ['-czf', out, '-C', work, basename(dir)], { encoding: 'utf8' })
  if (tar.status !== 0) throw new Error(`tar failed: ${tar.stderr}`)
  console.log(`[backup] ${out}: the database and ${objects.length} object(s)`
    + `${local ? '' : ' listed by hash (they stay in the object store)'}`)
}
finally {
  await client.end()
  rmSync(work, { recursive: true, force: true })
}
