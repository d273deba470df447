export default defineEventHandler(async (event) => {
  const { eventId, roles, teamIds, asAdmin } = await requireEventRole(event, 'any', { admin: true })
  const teamOnly = !asAdmin && roles.every(r => r === 'team')
  return statementsAt(eventId, teamOnly ? teamIds : null)
})
