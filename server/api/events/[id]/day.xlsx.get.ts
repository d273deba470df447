import { dayPaperQuerySchema } from '#shared/schemas/paper'

// The day's runs and the start list as an Excel workbook (exceljs), the same rows as the CSV.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const { date } = validQuery(event, dayPaperQuerySchema)
  const paper = await dayPaper(eventId, date)
  const bytes = await dayXlsx(paper)
  setHeaders(event, {
    'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    'content-disposition': `attachment; filename="trapline-day-${paper.date}.xlsx"`,
    'content-length': bytes.length,
  })
  return bytes
})
