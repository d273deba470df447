import { distanceSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, distanceSchema)
  const created = await addMeasuredDistance(eventId, input)
  setResponseStatus(event, 201)
  return created
})
