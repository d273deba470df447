import { inviteSchema } from '#shared/schemas/events'

export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'], { admin: true })
  const input = await validBody(event, inviteSchema)
  const result = await invitePerson({ ...input, eventId, invitedBy: user.id })
  setResponseStatus(event, 201)
  return result
})
