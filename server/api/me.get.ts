export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return { user, memberships: await membershipsOf(user.id) }
})
