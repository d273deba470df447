// What the backup and the restore share: the PostgreSQL tools of this machine, the database of the
// installation, and where the disk store keeps an object.
import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'

export const ROOT = resolve(import.meta.dirname, '..')

/** A PostgreSQL client program (pg_dump, pg_restore): from PGBIN, else the newest Debian installs. */
export function pgTool(name) {
  const dirs = [process.env.PGBIN, ...readdirSync('/usr/lib/postgresql', { withFileTypes: true })
    .filter(d => d.isDirectory()).map(d => join('/usr/lib/postgresql', d.name, 'bin'))
    .sort((a, b) => b.localeCompare(a, undefined, { numeric: true }))].filter(Boolean)
  const found = dirs.map(d => join(d, name)).find(p => existsSync(p))
  if (!found) throw new Error(`${name} is not installed (PostgreSQL's client programs, Debian's postgresql package)`)
  return found
}

/**
 * The database as its owner (a backup reads every table, a restore creates them): DATABASE_URL, else the
 * database of `npm start` on this machine (running).
 */
export function ownerDatabaseUrl() {
  if (process.env.DATABASE_URL) return process.env.DATABASE_URL
  const file = join(ROOT, '.data/pg-main.password')
  if (!existsSync(file)) throw new Error('set DATABASE_URL to the database (as its owner), or run npm start first')
  const port = process.env.TRAPLINE_PG_PORT ?? '54329'
  return `postgres://postgres:${readFileSync(file, 'utf8').trim()}@127.0.0.1:${port}/trapline`
}

export const dataDir = () => resolve(ROOT, process.env.NUXT_DATA_DIR ?? '.data')
export const storageDriver = () => process.env.NUXT_STORAGE_DRIVER ?? 'local'
/** Where the disk store keeps an object (server/utils/evidence/blob-store.ts). */
export const objectPath = sha => join(dataDir(), 'evidence', sha.slice(0, 2), sha)
