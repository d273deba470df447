import { weatherSchema } from '#shared/schemas/event-day'

// A device that queued the write offline sends an Idempotency-Key: a resend never writes twice.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, weatherSchema)
  return onceByKey(event, user.id, 201, () => addWeather(recordId, input, user.id))
})
