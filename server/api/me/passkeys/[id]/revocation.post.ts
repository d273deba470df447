import { idParams } from '#shared/schemas/event-day'
import { passkeyRevocationSchema } from '#shared/schemas/passkeys'

// The owner revokes one of their passkeys, with the password and a reason: a new row; what it signed stays checkable.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = validParams(event, idParams)
  const input = await validBody(event, passkeyRevocationSchema)
  await assertPassword(user.id, input.password)
  const revoked = await revokePasskey(user, id, input.reason)
  setResponseStatus(event, 201)
  return revoked
})
