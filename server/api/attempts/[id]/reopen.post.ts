import { reopenSheetSchema } from '#shared/schemas/event-day'

// Reopening a signed sheet is itself signed, with the reason; the old signature stays.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['timekeeper'])
  const input = await validBody(event, reopenSheetSchema)
  const signed = await signTimingSheet({
    eventId,
    attemptId: recordId,
    userId: user.id,
    password: input.password,
    passkey: input.passkey,
    typedName: input.typedName,
    nameNote: input.nameNote,
    reopen: input.reason,
  })
  setResponseStatus(event, 201)
  return signed
})
