import { busSchema } from '#shared/schemas/inspection'

// The high-voltage bus the isolation is checked against.
export default defineEventHandler(async (event) => {
  const { recordId } = await requireRoleOn(event, 'inspection', ['scrutineer'])
  const input = await validBody(event, busSchema)
  return setBus(recordId, input)
})
