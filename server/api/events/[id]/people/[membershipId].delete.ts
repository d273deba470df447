import { z } from 'zod'
import { recordId } from '#shared/schemas/fields'

// The organiser removes a person's role at the event (the person and what they signed stay).
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'], { admin: true })
  const { membershipId } = validParams(event, z.object({ id: recordId, membershipId: recordId }))
  await removeRole(eventId, membershipId, user.id)
  setResponseStatus(event, 204)
  return null
})
