import { passkeyRegistrationSchema } from '#shared/schemas/passkeys'

// Registers a passkey from the browser's answer to the options: its public key is kept for good.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const input = await validBody(event, passkeyRegistrationSchema)
  const created = await registerPasskey(user.id, input.name, input.response as never)
  setResponseStatus(event, 201)
  return created
})
