// Everyone at the event sees the live results; the page polls this every few seconds.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const day = await loadEventDay(eventId)
  return { now: new Date().toISOString(), attempts: computeLive(day) }
})
