import { feesSchema } from '#shared/schemas/payments'

// The organiser sets the event's fees, in its currency, as integer minor units.
export default defineEventHandler(async (event) => {
  const { eventId } = await requireEventRole(event, ['organiser'])
  return setFees(eventId, await validBody(event, feesSchema))
})
