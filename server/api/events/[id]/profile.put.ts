import { profileAdaptSchema } from '#shared/schemas/event-day'

// Attempts keep the profile they opened with; this changes only attempts opened from now on.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, profileAdaptSchema)
  return adaptProfile(eventId, input)
})
