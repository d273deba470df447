import { eq } from 'drizzle-orm'

// The scrutineers, the organiser and the officials see every inspection; a team its own only.
export default defineEventHandler(async (event) => {
  const { recordId, roles, teamIds, eventId } = await requireRoleOn(event, 'inspection', 'any')
  const view = await inspectionView(recordId)
  const [entry] = await useDb()
    .select({ teamId: tables.entries.teamId })
    .from(tables.entries)
    .where(eq(tables.entries.id, view.inspection.entryId))
  if (roles.every(r => r === 'team') && !teamIds.includes(entry!.teamId))
    throw notFound('No such inspection')
  return { ...view, timeZone: await eventTimeZone(eventId) }
})
