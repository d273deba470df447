import { classesAdaptSchema } from '#shared/schemas/event-day'

// The organiser adapts the event's class list (left out, added), with the rulebook it follows.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const input = await validBody(event, classesAdaptSchema)
  return adaptEventClasses(eventId, input)
})
