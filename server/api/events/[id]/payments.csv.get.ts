// The payments for the accounts, as CSV.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  const { payments } = await paymentsAt(eventId)
  setHeaders(event, {
    'content-type': 'text/csv; charset=utf-8',
    'content-disposition': `attachment; filename="trapline-payments-${eventId}.csv"`,
  })
  return paymentsCsv(payments)
})
