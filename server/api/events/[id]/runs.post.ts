import { startRunSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['timekeeper'])
  const input = await validBody(event, startRunSchema)
  const run = await startRun(eventId, input, user.id)
  setResponseStatus(event, 201)
  return run
})
