import { statementDraftSchema } from '#shared/schemas/passkeys'

// A passkey signs a statement before it is written: the challenge is the SHA-256 of what it will say.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['official'])
  const draft = await validBody(event, statementDraftSchema)
  const row = { ...draft, id: 0, eventId, authorId: user.id, withdrawsId: null, reason: null }
  return signingOptions(user.id, passkeyDigest('statement', statementContent(row as never, user.name)))
})
