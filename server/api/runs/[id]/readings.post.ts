import { readingSchema } from '#shared/schemas/event-day'

// A device that queued the write offline sends an Idempotency-Key: a resend never writes twice.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, readingSchema)
  return onceByKey(event, user.id, 201, () => enterReading(recordId, input, user.id))
})
