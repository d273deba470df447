import { decisionDraftSchema } from '#shared/schemas/passkeys'

// A passkey signs a decision on the dossier before it is written: the challenge is its content's SHA-256.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'dossier', ['official'])
  const draft = await validBody(event, decisionDraftSchema)
  return signingOptions(user.id, passkeyDigest('ratification', await decisionDraftContent(recordId, draft)))
})
