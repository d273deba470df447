import { and, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'

const KEY = /^[\w-]{8,80}$/

/**
 * Runs a write once per Idempotency-Key (the header a device sets on what it queued while offline): the
 * first request claims the key and its answer is kept; a resend gets that answer (success or refusal)
 * without writing again. A failure of the server's own releases the key, so the resend tries again.
 * Without the header the write simply runs.
 */
export async function onceByKey<T>(event: H3Event, userId: number, status: number, work: () => Promise<T>) {
  const key = getRequestHeader(event, 'idempotency-key')
  if (key === undefined) {
    const result = await work()
    setResponseStatus(event, status)
    return result
  }
  if (!KEY.test(key)) throw fieldInvalid('Idempotency-Key', 'must be 8 to 80 letters, digits, - or _')
  const db = useDb()
  const t = tables.idempotentRequests
  const request = `${event.method} ${event.path}`
  const claimed = await db.insert(t).values({ userId, key, request }).onConflictDoNothing().returning({ key: t.key })
  const mine = and(eq(t.userId, userId), eq(t.key, key))
  if (!claimed.length) return replay<T>(event, (await db.select().from(t).where(mine))[0]!, request)
  let result: T
  try {
    result = await work()
  }
  catch (e) {
    const err = e as { statusCode?: number, statusMessage?: string, data?: unknown }
    if (err.statusCode && err.statusCode >= 400 && err.statusCode < 500) {
      const body = { statusMessage: err.statusMessage, data: err.data ?? null }
      await db.update(t).set({ status: err.statusCode, body }).where(mine)
    }
    else {
      await db.delete(t).where(mine)
    }
    throw e
  }
  // Written: the key stays claimed whatever happens next, so a resend can never write twice.
  const body = JSON.parse(JSON.stringify(result, (_, v) => (typeof v === 'bigint' ? v.toString() : v)) ?? 'null')
  await db.update(t).set({ status, body }).where(mine)
  setResponseStatus(event, status)
  return result
}

function replay<T>(event: H3Event, row: typeof tables.idempotentRequests.$inferSelect, request: string): T {
  if (row.request !== request) throw fieldInvalid('Idempotency-Key', 'was already used for another request')
  if (row.status === null) throw conflict('This request is still being written; send it again in a moment')
  setHeader(event, 'idempotent-replay', 'true')
  if (row.status >= 400) {
    const body = row.body as { statusMessage?: string, data?: unknown }
    throw createError({ statusCode: row.status, statusMessage: body.statusMessage, data: body.data })
  }
  setResponseStatus(event, row.status)
  return row.body as T
}
