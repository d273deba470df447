import { evidenceQuerySchema } from '#shared/schemas/evidence'

export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  const filter = validQuery(event, evidenceQuerySchema)
  return listEvidence(access, filter)
})
