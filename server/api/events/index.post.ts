import { createEventSchema } from '#shared/schemas/events'

// Not requireRole: creating events is the site administrator's, checked by requireAdmin.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  const input = await validBody(event, createEventSchema)
  const created = await createEventWithOrganiser(input, admin.id)
  setResponseStatus(event, 201)
  return created
})
