import { updateEventSchema } from '#shared/schemas/events'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'], { admin: true })
  const changes = await validBody(event, updateEventSchema)
  return updateEvent(eventId, changes)
})
