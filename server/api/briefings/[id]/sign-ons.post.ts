import { signOnSchema } from '#shared/schemas/officials'

// An attendee signs on to a briefing: on their own phone, or in person on the organiser's device.
export default defineEventHandler(async (event) => {
  const { recordId, user, teamIds, roles } = await requireRoleOn(event, 'briefing', 'any')
  const input = await validBody(event, signOnSchema)
  setResponseStatus(event, 201)
  return signOnBriefing(recordId, input, user, { teamIds, organiser: roles.includes('organiser') })
})
