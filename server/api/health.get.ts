import { sql } from 'drizzle-orm'

// public route: liveness for the scripts and the tests; waits for the demo seed when there is one.
export default defineEventHandler(async () => {
  await demoSeeded()
  await useDb().execute(sql`select 1`)
  return { ok: true }
})
