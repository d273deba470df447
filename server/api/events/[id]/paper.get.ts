import { dayPaperQuerySchema } from '#shared/schemas/paper'

// The day's paper for its print-ready pages: start list, run order and results by class.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const { date } = validQuery(event, dayPaperQuerySchema)
  return dayPaper(eventId, date)
})
