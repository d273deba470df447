export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  const { eventId, teamIds } = access
  const teamOnly = actsAsTeamOnly(access)
  return statementsAt(eventId, teamOnly ? teamIds : null)
})
