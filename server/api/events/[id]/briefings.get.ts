// The event's riders' briefings, who signed on to each (how, when) and which riders have not.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any')
  return briefingsOf(eventId)
})
