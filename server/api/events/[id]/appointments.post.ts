import { appointmentSchema } from '#shared/schemas/officials'

// The organiser appoints a person of the event to an official function.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, appointmentSchema)
  setResponseStatus(event, 201)
  return appoint(eventId, input.function, input.userId, user.id)
})
