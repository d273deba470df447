export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'], { admin: true })
  return peopleAt(eventId)
})
