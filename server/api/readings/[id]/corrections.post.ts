import { correctionSchema } from '#shared/schemas/event-day'

// A device that queued the write offline sends an Idempotency-Key: a resend never writes twice.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'reading', ['timekeeper'])
  const input = await validBody(event, correctionSchema)
  return onceByKey(event, user.id, 201, () => correctReading(recordId, input, user.id))
})
