// The event's protests and appeals, with their deadlines and decisions as the event's clock shows them.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any')
  return protestsOf(eventId)
})
