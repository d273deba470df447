import { checklistAdaptSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, checklistAdaptSchema)
  const created = await adaptChecklist(eventId, input, user.id)
  setResponseStatus(event, 201)
  return created
})
