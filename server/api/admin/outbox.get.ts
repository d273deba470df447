// Mail the outbox has not delivered yet, with the last error: what keeps failing is shown, never dropped.
// Not requireEventRole: the outbox is the site's, so this is the site administrator's, checked by requireAdmin.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  return undeliveredMail()
})
