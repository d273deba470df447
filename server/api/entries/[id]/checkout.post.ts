import { eq } from 'drizzle-orm'
import { checkoutSchema } from '#shared/schemas/payments'

// A team pays a fee of its entry: a checkout session at the payment provider, whose hosted page it is sent to.
export default defineEventHandler(async (event) => {
  const { recordId, teamIds, user } = await requireRoleOn(event, 'entry', ['team'])
  const { fee } = await validBody(event, checkoutSchema)
  const [entry] = await useDb().select({ teamId: tables.entries.teamId }).from(tables.entries)
    .where(eq(tables.entries.id, recordId))
  if (!entry || !teamIds.includes(entry.teamId)) throw notFound('No such entry')
  setResponseStatus(event, 201)
  return startCheckout(recordId, fee, user.id, user.email)
})
