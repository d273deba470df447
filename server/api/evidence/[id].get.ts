export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'evidence', 'any')
  return findEvidence(access, { id: access.recordId })
})
