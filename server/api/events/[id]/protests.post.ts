import { protestSchema } from '#shared/schemas/protests'

// A team lodges a signed protest about an attempt, within the profile's deadline after publication.
export default defineEventHandler(async (event) => {
  const { eventId, user, teamIds } = await requireEventRole(event, ['team'])
  const input = await validBody(event, protestSchema)
  setResponseStatus(event, 201)
  return lodgeProtest(eventId, input, user, teamIds)
})
