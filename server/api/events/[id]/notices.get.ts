// The event's notice board: every official notice, with its issuer and signature.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any')
  return noticesAt(eventId)
})
