import { correctionSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'reading', ['timekeeper'])
  const input = await validBody(event, correctionSchema)
  const created = await correctReading(recordId, input, user.id)
  setResponseStatus(event, 201)
  return created
})
