import { passkeyRegistrationSchema } from '#shared/schemas/passkeys'

// Registers a passkey from the browser's answer to the options, confirmed with the password: its public key is
// kept for good, and the owner is mailed.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const input = await validBody(event, passkeyRegistrationSchema)
  await assertPassword(user.id, input.password)
  const created = await registerPasskey(user, input.name, input.response as never)
  setResponseStatus(event, 201)
  return created
})
