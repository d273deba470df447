import { recordBookQuerySchema } from '#shared/schemas/record-book'

// public route: the record book as an Excel workbook (exceljs), the same rows and headers as the CSV.
export default defineEventHandler(async (event) => {
  const book = await recordBook(validQuery(event, recordBookQuerySchema))
  const bytes = await recordBookXlsx(book)
  setHeaders(event, {
    'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    'content-disposition': 'attachment; filename="trapline-record-book.xlsx"',
    'content-length': bytes.length,
  })
  return bytes
})
