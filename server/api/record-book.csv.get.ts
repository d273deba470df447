// public route: the record book as CSV, units in the headers, one row per record (previous holders apart).
export default defineEventHandler(async (event) => {
  const csv = recordBookCsv(await recordBook())
  setHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': 'attachment; filename="trapline-record-book.csv"',
  })
  return csv
})
