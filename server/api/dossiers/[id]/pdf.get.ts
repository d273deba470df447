import { eq } from 'drizzle-orm'
import { idParams } from '#shared/schemas/event-day'

// public route once ratified: the record book links here. Before that, the people of the event only.
export default defineEventHandler(async (event) => {
  const { id } = validParams(event, idParams)
  if (!(await isRatified(id))) {
    const access = await requireRoleOn(event, 'dossier', 'any')
    const [d] = await useDb()
      .select({ attemptId: tables.dossiers.attemptId })
      .from(tables.dossiers)
      .where(eq(tables.dossiers.id, id))
    await assertOwnAttempt(access, d!.attemptId)
  }
  const [d] = await useDb().select().from(tables.dossiers).where(eq(tables.dossiers.id, id))
  if (!d) throw notFound('No such dossier')
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': d.pdfSize,
    'content-disposition': `attachment; filename="trapline-dossier-attempt-${d.attemptId}-v${d.version}.pdf"`,
    'x-content-type-options': 'nosniff',
  })
  return sendStored(event, await useBlobStore().open(d.pdfSha256))
})
