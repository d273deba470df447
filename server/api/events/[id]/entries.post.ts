import { entrySchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId, teamIds } = await requireEventRole(event, ['team'])
  const input = await validBody(event, entrySchema)
  const entry = await addEntry(eventId, teamIds[0]!, input)
  setResponseStatus(event, 201)
  return entry
})
