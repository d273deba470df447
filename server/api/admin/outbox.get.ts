// Mail the outbox has not delivered yet, with the last error: what keeps failing is shown, never dropped.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  return undeliveredMail()
})
