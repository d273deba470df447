import { suspensionSchema } from '#shared/schemas/inspection'

// A scrutineer suspends a machine after an incident or a modification; a new inspection clears it.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'machine', ['scrutineer'])
  const input = await validBody(event, suspensionSchema)
  const row = await suspendMachine(eventId, recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
