import { asc, eq } from 'drizzle-orm'
import { checklistLibrary } from '#shared/inspection/templates'
import { CHECKLIST_CAUTION } from '#shared/inspection/template'

export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const copies = await useDb()
    .select()
    .from(tables.checklists)
    .where(eq(tables.checklists.eventId, eventId))
    .orderBy(asc(tables.checklists.id))
  return { caution: CHECKLIST_CAUTION, library: Object.values(checklistLibrary), event: copies }
})
