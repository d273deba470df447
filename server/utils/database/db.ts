import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres'
import pg from 'pg'
import * as schema from '../../database/schema'

export { schema as tables }
export type Db = NodePgDatabase<typeof schema>
/** A transaction, as handed to the callback of `useDb().transaction`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0]

let db: Db | undefined
let pool: pg.Pool | undefined

/** The one way to reach the database. */
export function useDb(): Db {
  if (!db) {
    const { databaseUrl } = useRuntimeConfig()
    if (!databaseUrl) throw new Error('NUXT_DATABASE_URL is not set')
    pool = new pg.Pool({
      connectionString: databaseUrl,
      max: 10,
      // A request waits at most 10 s for a connection (then fails, rather than queueing for ever), and no
      // statement runs longer than 30 s; an idle client is returned after 30 s.
      connectionTimeoutMillis: 10_000,
      idleTimeoutMillis: 30_000,
      statement_timeout: 30_000,
    })
    db = drizzle(pool, { schema })
  }
  return db
}

/** The pool under the database, for libraries that speak to PostgreSQL themselves (rate limits). */
export function usePool(): pg.Pool {
  useDb()
  return pool!
}

export async function closeDb() {
  await pool?.end()
  pool = undefined
  db = undefined
}
