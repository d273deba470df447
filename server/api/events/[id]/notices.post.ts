import { noticeSchema } from '#shared/schemas/notices'

// An official (or the organiser) publishes a signed notice; the teams are mailed.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['official', 'organiser'])
  const input = await validBody(event, noticeSchema)
  setResponseStatus(event, 201)
  return publishNotice(eventId, input, user)
})
