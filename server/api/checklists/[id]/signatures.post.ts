import { signRecordSchema } from '#shared/schemas/inspection'

// A scrutineer approves an adapted checklist that leaves out safety items, with the articles it names.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'checklist', ['scrutineer'])
  const input = await validBody(event, signRecordSchema)
  const signed = await signChecklist(recordId, input, user)
  setResponseStatus(event, 201)
  return signed
})
