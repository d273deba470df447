import { readingSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, readingSchema)
  const created = await enterReading(recordId, input, user.id)
  setResponseStatus(event, 201)
  return created
})
