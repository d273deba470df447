import { signRecordSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  const input = await validBody(event, signRecordSchema)
  const signed = await signInspection(recordId, input, user)
  setResponseStatus(event, 201)
  return signed
})
