import { z } from 'zod'

// The file itself, streamed from storage: inline for the in-page viewer, or as a download. Served
// sandboxed and without type sniffing, since its content came from outside.
export default defineEventHandler(async (event) => {
  const access = await requireRoleOn(event, 'evidence', 'any')
  const { download } = validQuery(event, z.object({ download: z.enum(['0', '1']).optional() }))
  const row = await findEvidence(access, { id: access.recordId })
  const name = encodeURIComponent(row.originalName)
  setHeaders(event, {
    'content-type': row.mediaType,
    'content-length': Number(row.size),
    'content-disposition': `${download === '1' ? 'attachment' : 'inline'}; filename*=UTF-8''${name}`,
    'x-content-type-options': 'nosniff',
    // Sandboxed, except PDFs: browsers will not show a PDF in a sandboxed document.
    'content-security-policy':
      row.mediaType === 'application/pdf'
        ? 'default-src \'none\''
        : 'sandbox; default-src \'none\'; img-src \'self\'; style-src \'unsafe-inline\'',
    'cache-control': 'private, max-age=31536000, immutable',
    'etag': `"${row.sha256}"`,
  })
  return sendStored(event, await useBlobStore().open(row.sha256))
})
