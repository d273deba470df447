// public route: the payment provider's webhook. Its signature is checked with the provider SDK's own function
// over the raw body; each event is taken once by its id.
export default defineEventHandler(async (event) => {
  const raw = (await readRawBody(event, 'utf8')) ?? ''
  return takeWebhook(raw, getHeader(event, 'stripe-signature'))
})
