import { setAsideSchema } from '#shared/schemas/inspection'

// An appointed steward proposes setting a failing finding aside: signed, with the reason in writing; it takes
// effect once the profile's quorum of stewards has signed.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['official'])
  const input = await validBody(event, setAsideSchema)
  const row = await setAsideFinding(eventId, recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
