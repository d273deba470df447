import { signSheetSchema } from '#shared/schemas/event-day'

// The timekeeper signs the attempt's timing sheet: password again, full name typed.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['timekeeper'])
  const input = await validBody(event, signSheetSchema)
  const signed = await signTimingSheet({
    eventId,
    attemptId: recordId,
    userId: user.id,
    password: input.password,
    passkey: input.passkey,
    typedName: input.typedName,
    nameNote: input.nameNote,
  })
  setResponseStatus(event, 201)
  return signed
})
