import { signSheetSchema } from '#shared/schemas/event-day'

// An appointed steward confirms the attempt's result, signed, once the protest and appeal periods have ended and
// every protest is decided; the result is confirmed when the profile's quorum of stewards has signed.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'attempt', ['official'])
  const input = await validBody(event, signSheetSchema)
  const row = await confirmResult(recordId, input, user, { now: testClock(event) ?? new Date() })
  setResponseStatus(event, 201)
  return row
})
