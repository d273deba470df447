import { sql } from 'drizzle-orm'

// public route: readiness for a load balancer. 200 when this server can reach the database and the evidence
// store; 503 naming what it cannot reach (the balancer sends no request here meanwhile).
export default defineEventHandler(async (event) => {
  const check = async (what: () => Promise<unknown>) => {
    try {
      await what()
      return 'ok'
    }
    catch (e) {
      return `unreachable: ${(e as Error).name}`
    }
  }
  const [database, storage] = await Promise.all([
    check(() => useDb().execute(sql`select 1`)),
    check(() => useBlobStore().ready()),
  ])
  const ok = database === 'ok' && storage === 'ok'
  setResponseStatus(event, ok ? 200 : 503)
  setResponseHeader(event, 'cache-control', 'no-store')
  return { ok, server: useRuntimeConfig().serverId, database, storage }
})
