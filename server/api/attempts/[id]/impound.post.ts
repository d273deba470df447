import { impoundSchema } from '#shared/schemas/event-day'

// The scrutineer records the machine's check-in at the impound after its qualifying run.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['scrutineer'])
  const input = await validBody(event, impoundSchema)
  const row = await checkIntoImpound(eventId, recordId, input, user.id)
  setResponseStatus(event, 201)
  return row
})
