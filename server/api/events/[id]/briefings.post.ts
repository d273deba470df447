import { briefingSchema } from '#shared/schemas/officials'

// The organiser (or an official) records a riders' briefing: its subject and when it is held.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser', 'official'])
  const input = await validBody(event, briefingSchema)
  setResponseStatus(event, 201)
  return createBriefing(eventId, input, user.id)
})
