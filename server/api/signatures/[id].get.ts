// Who signed what and when, and whether the signed content still matches its hash, and whether the
// record as it is now still hashes the same.
export default defineEventHandler(async (event) => {
  const { recordId, roles, teamIds, eventId } = await requireRoleOn(event, 'signature', 'any')
  const report = await signatureReport(recordId)
  if (roles.every(r => r === 'team') && !teamIds.includes(report.teamId))
    throw notFound('No such signature')
  return { ...report, timeZone: await eventTimeZone(eventId) }
})
