import { and, eq, ne } from 'drizzle-orm'
import { abortSchema } from '#shared/schemas/event-day'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'run', ['timekeeper'])
  const { reason } = await validBody(event, abortSchema)
  const [run] = await useDb()
    .update(tables.runs)
    .set({ status: 'aborted', abortedReason: reason, abortedBy: user.id })
    .where(and(eq(tables.runs.id, recordId), ne(tables.runs.status, 'aborted')))
    .returning()
  if (!run) throw conflict('This run is already aborted')
  return run
})
