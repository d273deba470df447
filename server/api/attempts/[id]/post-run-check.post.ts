import { postRunCheckSchema } from '#shared/schemas/inspection'

// The scrutineer records the machine's check after a record run (mass re-measured), signed.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['scrutineer'])
  const input = await validBody(event, postRunCheckSchema)
  const row = await recordPostRunCheck(eventId, recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
