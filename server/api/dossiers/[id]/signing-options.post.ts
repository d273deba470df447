import { decisionDraftSchema } from '#shared/schemas/passkeys'

// A passkey signs a decision on the dossier before it is written: the server issues a random,
// single-use challenge over the SHA-256 of that content, for this signer and this act.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'dossier', ['official'])
  const draft = await validBody(event, decisionDraftSchema)
  return signingOptions(user.id, 'ratification',
    passkeyDigest('ratification', await decisionDraftContent(recordId, draft)))
})
