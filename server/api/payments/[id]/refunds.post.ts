import { refundSchema } from '#shared/schemas/payments'

// The organiser refunds a paid fee, partly or wholly, with a reason; the provider's webhook confirms it.
export default defineEventHandler(async (event) => {
  const { recordId, user } = await requireRoleOn(event, 'payment', ['organiser'])
  const input = await validBody(event, refundSchema)
  setResponseStatus(event, 201)
  return refundPayment(recordId, input, user.id)
})
