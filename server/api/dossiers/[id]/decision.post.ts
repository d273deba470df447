import { decisionSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'dossier', ['official'])
  const input = await validBody(event, decisionSchema)
  const decision = await decideDossier(recordId, input, user)
  setResponseStatus(event, 201)
  return decision
})
