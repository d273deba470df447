import { logoutSchema } from '#shared/schemas/auth'

// public route: signing out without a session is harmless; `everywhere` ends every session of the person.
export default defineEventHandler(async (event) => {
  const { everywhere } = await validBody(event, logoutSchema)
  const user = everywhere ? await sessionUser(event) : null
  if (user) await endSessions(user.id)
  await signOut(event)
  setResponseStatus(event, 204)
  return null
})
