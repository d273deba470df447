export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'attempt', 'any')
  await assertOwnAttempt(access, access.recordId)
  return dossiersOf(access.recordId)
})
