import { setAsideSchema } from '#shared/schemas/inspection'

// An appointed steward proposes setting a failing finding aside: signed, with the reason in writing; it takes
// effect once the profile's quorum of stewards has signed. A gap in the timing evidence is the appointed chief
// timekeeper's to account for, alone (the function is checked inside, the role here).
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['official', 'timekeeper'])
  const input = await validBody(event, setAsideSchema)
  const row = await setAsideFinding(eventId, recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
