import { csvImportSchema } from '#shared/schemas/event-day'

// With commit false: a preview and every error with its line and column. Nothing is written
// unless the whole file is valid.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['timekeeper'])
  const input = await validBody(event, csvImportSchema)
  const result = await importReadings(eventId, input, user.id)
  if (!result.ok) setResponseStatus(event, 422)
  return result
})
