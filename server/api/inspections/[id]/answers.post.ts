import { answerSchema } from '#shared/schemas/inspection'

export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  const input = await validBody(event, answerSchema)
  return answerItem(recordId, input, user.id)
})
