// Multipart: the fields (kind, and what the file belongs to) first, then the field "file". The file
// is streamed to disk while hashed; its row is written only once it is complete and in place. Fields
// after the file are refused: only what was checked before the first byte is stored.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any')
  const checked: GateRecord = {}
  const { file, fields } = await receiveUpload(event, evidenceGate(access, checked))
  if (!file) throw fieldInvalid('file', 'no file was sent')
  const created = await commitEvidence(access, await checkedFields(file, fields, checked), file)
  setResponseStatus(event, 201)
  return created
})
