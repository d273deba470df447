import { dayPaperQuerySchema } from '#shared/schemas/paper'

// The day's runs as CSV, units in the headers.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const { date } = validQuery(event, dayPaperQuerySchema)
  const paper = await dayPaper(eventId, date)
  setHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="trapline-day-${paper.date}.csv"`,
  })
  return dayCsv(paper)
})
