import { eq } from 'drizzle-orm'
import { withdrawalSchema } from '#shared/schemas/record-book'

// The team withdraws its submitted claim before the officials decide, with a reason (kept, never edited).
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'dossier', ['team'])
  const { reason } = await validBody(event, withdrawalSchema)
  const [d] = await useDb().select({ attemptId: tables.dossiers.attemptId }).from(tables.dossiers)
    .where(eq(tables.dossiers.id, access.recordId))
  await assertOwnAttempt(access, d!.attemptId)
  const row = await withdrawClaim(access.recordId, reason, access.user.id)
  setResponseStatus(event, 201)
  return row
})
