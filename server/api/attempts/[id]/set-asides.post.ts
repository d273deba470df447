import { setAsideSchema } from '#shared/schemas/inspection'

// An official sets a failing finding of the attempt aside: signed, with the reason in writing.
export default defineEventHandler(async (event) => {
  const { recordId, eventId, user } = await requireRoleOn(event, 'attempt', ['official'])
  const input = await validBody(event, setAsideSchema)
  const row = await setAsideFinding(eventId, recordId, input, user)
  setResponseStatus(event, 201)
  return row
})
