import { eq } from 'drizzle-orm'

// Computed live results per event, valid while the event's data_version (bumped by triggers on
// every table the results read) is unchanged. Every request checks the version in PostgreSQL, so
// several app servers stay in step; concurrent requests share one computation.
const cache = new Map<number, { version: number, json: Promise<string> }>()
const MAX_EVENTS = 64

/** The version tag of an event's live results, for ETag revalidation without computing anything. */
export async function liveResultsTag(eventId: number) {
  const [row] = await useDb()
    .select({ version: tables.events.dataVersion })
    .from(tables.events)
    .where(eq(tables.events.id, eventId))
  if (!row) throw notFound('No such event')
  return { version: row.version, etag: `"live-${eventId}-${row.version}"` }
}

export async function liveResultsJson(eventId: number, version: number): Promise<string> {
  const hit = cache.get(eventId)
  if (hit && hit.version === version) return hit.json
  const json = loadEventDay(eventId).then(day => JSON.stringify(computeLive(day)))
  cache.delete(eventId)
  cache.set(eventId, { version, json })
  if (cache.size > MAX_EVENTS) cache.delete(cache.keys().next().value!)
  json.catch(() => {
    if (cache.get(eventId)?.json === json) cache.delete(eventId)
  })
  return json
}
