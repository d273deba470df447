// The organiser's view of the fees: who has paid, refunds, totals by fee.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  return { fees: await feesOf(eventId), ...(await paymentsAt(eventId)) }
})
