import { startInspectionSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['scrutineer'])
  const input = await validBody(event, startInspectionSchema)
  const created = await startInspection(eventId, input, user.id)
  setResponseStatus(event, 201)
  return created
})
