// The browser's view of the session (nuxt-auth-utils' session route) follows the database too: an
// ended session or a person no longer an administrator shows as such at once.
export default defineNitroPlugin(() => {
  sessionHooks.hook('fetch', async (session, event) => {
    const user = await sessionUser(event)
    if (!user) throw createError({ statusCode: 401, statusMessage: 'Your session has ended: sign in again' })
    session.user = user
  })
})
