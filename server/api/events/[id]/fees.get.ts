import { eq } from 'drizzle-orm'

// The event's fees and, for each entry the person may see (a team its own, the organiser all), what it owes and
// whether each fee is paid, pending or failed.
export default defineEventHandler(async (event) => {
  const access = await requireEventRole(event, 'any', { admin: true })
  const fees = await feesOf(access.eventId)
  const [ev] = await useDb().select({ timeZone: tables.events.timeZone }).from(tables.events)
    .where(eq(tables.events.id, access.eventId))
  const all = await useDb().select().from(tables.entries).where(eq(tables.entries.eventId, access.eventId))
  const mine = actsAsTeamOnly(access) ? all.filter(e => access.teamIds.includes(e.teamId)) : all
  const payments = await paymentsOf(mine.map(e => e.id))
  const state = (entryId: number, record: boolean) => {
    const own = payments.filter(p => p.entryId === entryId && (p.fee === 'record') === record)
    if (own.some(p => p.status === 'paid' && p.refundedMinor >= p.amountMinor)) return 'refunded'
    return own.find(p => p.status === 'paid')?.status ?? own[0]?.status ?? 'unpaid'
  }
  return {
    fees,
    entries: fees
      ? mine.map(e => ({
          entryId: e.id,
          entry: { ...amountDue(fees, e, 'entry', ev!.timeZone), state: state(e.id, false) },
          record: { ...amountDue(fees, e, 'record', ev!.timeZone), state: state(e.id, true) },
          payments: payments.filter(p => p.entryId === e.id)
            .map(p => ({
              id: p.id, fee: p.fee, status: p.status, amountMinor: p.amountMinor, refundedMinor: p.refundedMinor,
              receiptNo: p.receiptNo,
            })),
        }))
      : [],
  }
})
