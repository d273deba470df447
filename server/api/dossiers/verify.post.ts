import { readFile, rm } from 'node:fs/promises'

/** Verifications running at once in this server; more wait their turn by trying again. */
const MAX_AT_ONCE = 2
let running = 0

// public route: anyone may check a dossier. The PDF is the multipart field "file", streamed to disk.
export default defineEventHandler(async (event) => {
  await spend(['verifyByClient', clientAddress(event)])
  if (running >= MAX_AT_ONCE) {
    setResponseHeader(event, 'retry-after', 5)
    const message = 'Other dossiers are being checked; try again in a few seconds.'
    throw createError({ statusCode: 503, statusMessage: 'Busy', message })
  }
  running++
  try {
    const { file } = await receiveVerifyUpload(event)
    if (!file) throw fieldInvalid('file', 'no file was sent')
    try {
      const result = await verifyDossier(new Uint8Array(await readFile(file.path)))
      if (!result.keyFingerprint && !result.items.length) setResponseStatus(event, 422)
      return result
    }
    finally {
      await rm(file.path, { force: true })
    }
  }
  finally {
    running--
  }
})
