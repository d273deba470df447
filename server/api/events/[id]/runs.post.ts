import { startRunSchema } from '#shared/schemas/event-day'

// A device that queued the write offline sends an Idempotency-Key: a resend never writes twice.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['timekeeper'])
  const input = await validBody(event, startRunSchema)
  return onceByKey(event, user.id, 201, () => startRun(eventId, input, user.id))
})
