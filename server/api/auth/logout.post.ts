// public route: signing out without a session is harmless.
export default defineEventHandler(async (event) => {
  await signOut(event)
  setResponseStatus(event, 204)
  return null
})
