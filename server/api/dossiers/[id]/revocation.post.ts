import { revocationSchema } from '#shared/schemas/inspection'

// The function the profile names revokes a ratification with reasons, signed: the claim is open again.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'dossier', ['official'])
  const input = await validBody(event, revocationSchema)
  const revoked = await revokeRatification(recordId, input, user)
  setResponseStatus(event, 201)
  return revoked
})
