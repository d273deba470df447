export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  return eventOverview(access)
})
