// Options for registering a passkey: a challenge for this person, used once within five minutes.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return registrationOptions(user)
})
