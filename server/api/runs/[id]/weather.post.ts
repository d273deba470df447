import { weatherSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, weatherSchema)
  const row = await addWeather(recordId, input, user.id)
  setResponseStatus(event, 201)
  return row
})
