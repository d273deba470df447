// The payments for the accounts, as an Excel workbook (exceljs): the same rows as the CSV.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const bytes = await paymentsXlsx((await paymentsAt(eventId)).payments)
  setHeaders(event, {
    'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
    'content-disposition': `attachment; filename="trapline-payments-${eventId}.xlsx"`,
    'content-length': bytes.length,
  })
  return bytes
})
