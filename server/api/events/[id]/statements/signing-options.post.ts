import { statementDraftSchema } from '#shared/schemas/passkeys'

// A passkey signs a statement before it is written: the server issues a random,
// single-use challenge over the SHA-256 of that content, for this signer and this act.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['official'])
  const draft = await validBody(event, statementDraftSchema)
  const row = { ...draft, id: 0, eventId, authorId: user.id, withdrawsId: null, reason: null }
  return signingOptions(user.id, 'statement', passkeyDigest('statement', statementContent(row as never, user.name)))
})
