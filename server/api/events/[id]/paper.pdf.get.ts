import { dayPaperQuerySchema } from '#shared/schemas/paper'

// One of the day's papers as a PDF: results by class, start list and run order, or a run sheet to fill by hand.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, 'any', { admin: true })
  const { date, sheet } = validQuery(event, dayPaperQuerySchema)
  const paper = await dayPaper(eventId, date)
  const pdf = await dayPaperPdf(paper, sheet)
  setHeaders(event, {
    'content-type': 'application/pdf',
    'content-disposition': `inline; filename="trapline-${sheet}-${paper.date}.pdf"`,
  })
  return Buffer.from(pdf)
})
