import { retireSchema, setupItemParams } from '#shared/schemas/setup-corrections'

// The organiser retires a set-up item nothing uses: it leaves the set-up, its history and reason stay.
export default defineEventHandler(async (event) => {
  const { eventId, user } = await requireEventRole(event, ['organiser'])
  const { kind, itemId } = validParams(event, setupItemParams)
  const { reason } = await validBody(event, retireSchema)
  return retireSetupItem(eventId, kind, itemId, reason, user.id)
})
