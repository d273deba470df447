import { idParams } from '#shared/schemas/event-day'

// public route: the record holder's certificate of a ratified dossier, linked from the record book.
export default defineEventHandler(async (event) => {
  const { id } = validParams(event, idParams)
  const { pdf, name } = await recordCertificate(id)
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `attachment; filename="${name}"`,
    'x-content-type-options': 'nosniff',
  })
  return Buffer.from(pdf)
})
