import { evidenceFieldsSchema } from '#shared/schemas/evidence'

// Multipart: the fields (kind, and what the file belongs to) first, then the field "file". The file
// is streamed to disk while hashed; its row is written only once it is complete and in place.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any')
  const { file, fields } = await receiveUpload(event, evidenceGate(access))
  if (!file) throw fieldInvalid('file', 'no file was sent')
  const created = await commitEvidence(access, evidenceFieldsSchema.parse(fields), file)
  setResponseStatus(event, 201)
  return created
})
