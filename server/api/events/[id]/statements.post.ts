import { statementSchema } from '#shared/schemas/inspection'

// An official writes and signs a witness statement on an attempt in one step.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['official'])
  const input = await validBody(event, statementSchema)
  const created = await createStatement(eventId, input, user)
  setResponseStatus(event, 201)
  return created
})
