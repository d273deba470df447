import { eq } from 'drizzle-orm'

// The team submits its sealed dossier; the officials are e-mailed the PDF (retried if mail is down).
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'dossier', ['team'])
  const [d] = await useDb()
    .select({ attemptId: tables.dossiers.attemptId })
    .from(tables.dossiers)
    .where(eq(tables.dossiers.id, access.recordId))
  await assertOwnAttempt(access, d!.attemptId)
  const result = await submitDossier(access.recordId, access.user.id)
  setResponseStatus(event, 201)
  return result
})
