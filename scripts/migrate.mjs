// npm run migrate: applies the database migrations (drizzle/) as the database's owner, then the app role's
// grants (scripts/db-grants.sql) where that role exists. For a production start; idempotent.
//   DATABASE_URL=postgres://owner:…@db.example.org/trapline npm run migrate
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { drizzle } from 'drizzle-orm/node-postgres'
import { migrate } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'
import { ownerDatabaseUrl, ROOT } from './backup-lib.mjs'

const pool = new pg.Pool({ connectionString: ownerDatabaseUrl(), max: 1 })
try {
  await migrate(drizzle(pool), { migrationsFolder: join(ROOT, 'drizzle') })
  const role = await pool.query(`select 1 from pg_roles where rolname = 'trapline_app'`)
  if (role.rows.length) await pool.query(readFileSync(join(ROOT, 'scripts/db-grants.sql'), 'utf8'))
  else console.log('[migrate] create the role trapline_app (login) for the app, then run this again for its grants')
  console.log('[migrate] the database is up to date')
}
finally {
  await pool.end()
}
