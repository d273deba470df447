import { weatherSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const input = await validBody(event, weatherSchema)
  const [row] = await useDb()
    .insert(tables.weather)
    .values({ ...input, runId: recordId, enteredBy: user.id })
    .returning()
  setResponseStatus(event, 201)
  return row
})
