// public route: signing out without a session is harmless.
export default defineEventHandler(async (event) => {
  await clearUserSession(event)
  setResponseStatus(event, 204)
  return null
})
