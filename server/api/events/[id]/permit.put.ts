import { permitSchema } from '#shared/schemas/officials'

// The organiser records the event's permit (its document is attached as evidence).
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  return setPermit(eventId, await validBody(event, permitSchema))
})
