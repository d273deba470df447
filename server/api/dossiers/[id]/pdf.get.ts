import { eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { z } from 'zod'
import { idParams } from '#shared/schemas/event-day'

const copyQuery = z.object({ copy: z.enum(['officials', 'public']).optional() })

// public route once ratified: the record book links here, and anyone gets the public copy (no
// licence number, no personal files). The people of the event may read the officials' copy; before
// ratification only they may read either.
export default defineEventHandler(async (event) => {
  const { id } = validParams(event, idParams)
  const { copy } = validQuery(event, copyQuery)
  const [d] = await useDb().select().from(tables.dossiers).where(eq(tables.dossiers.id, id))
  const user = await sessionUser(event)
  const member = !!user && !!d && (await memberOf(event, d))
  if (!member && !(d && (await isRatified(id)))) {
    if (!user) throw createError({ statusCode: 401, statusMessage: 'Sign in first' })
    throw notFound('No such dossier')
  }
  const open = copy === 'public' || !member
  const sha = open && d!.publicPdfSha256 ? d!.publicPdfSha256 : d!.pdfSha256
  const size = open && d!.publicPdfSize ? d!.publicPdfSize : d!.pdfSize
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-length': size,
    'content-disposition': `attachment; filename="trapline-dossier-attempt-${d!.attemptId}-v${d!.version}`
      + `${open ? '-public' : ''}.pdf"`,
    'x-content-type-options': 'nosniff',
  })
  return sendStored(event, await useBlobStore().open(sha))
})

/** Whether the signed-in person may read this dossier's officials' copy (their event; a team its own). */
async function memberOf(event: H3Event, d: typeof tables.dossiers.$inferSelect) {
  try {
    const access = await requireRoleOn(event, 'dossier', 'any')
    await assertOwnAttempt(access, d.attemptId)
    return true
  }
  catch {
    return false
  }
}
