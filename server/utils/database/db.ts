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
    pool = new pg.Pool({ connectionString: databaseUrl, max: 10 })
    db = drizzle(pool, { schema })
  }
  return db
}

export async function closeDb() {
  await pool?.end()
  pool = undefined
  db = undefined
}
