import Papa from 'papaparse'
import { recordBookQuerySchema } from '#shared/schemas/record-book'

// public route: the record book as CSV (RFC 4180 through papaparse), units in the headers, one row per
// record and one per previous holder (marked), filtered as the registry page is.
export default defineEventHandler(async (event) => {
  const rows = exportRows(await recordBook(validQuery(event, recordBookQuerySchema)))
  const fields = [...EXPORT_HEADERS]
  setHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': 'attachment; filename="trapline-record-book.csv"',
  })
  // Headers even for an empty book.
  return Papa.unparse({ fields, data: rows.map(r => fields.map(f => r[f as keyof typeof r])) }, { newline: '\r\n' })
})
