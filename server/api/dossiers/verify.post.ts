import { readFile, rm } from 'node:fs/promises'

// public route: anyone may check a dossier. The PDF is the multipart field "file".
export default defineEventHandler(async (event) => {
  await spend(['verifyByClient', clientAddress(event)])
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
})
