import { withdrawalSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'statement', ['official'])
  const input = await validBody(event, withdrawalSchema)
  const created = await withdrawStatement(recordId, input, user)
  setResponseStatus(event, 201)
  return created
})
