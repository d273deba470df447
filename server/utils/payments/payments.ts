import Stripe from 'stripe'
import { and, desc, eq, inArray, sql } from 'drizzle-orm'
import type { FeesInput } from '#shared/schemas/payments'

let provider: Stripe | undefined
/** The payment provider's official SDK; pointed at the local fake by host, port and protocol where set. */
export function usePaymentProvider() {
  if (!provider) {
    const c = useRuntimeConfig().payments
    provider = new Stripe(c.secretKey, {
      ...(c.host ? { host: c.host, port: Number(c.port), protocol: c.protocol as 'http' | 'https' } : {}),
      maxNetworkRetries: 1,
      timeout: 20_000,
    })
  }
  return provider
}

export async function feesOf(eventId: number) {
  const [row] = await useDb().select().from(tables.eventFees).where(eq(tables.eventFees.eventId, eventId))
  return row ?? null
}

export async function setFees(eventId: number, input: FeesInput) {
  const values = { eventId, ...input, updatedAt: new Date() }
  const [row] = await useDb().insert(tables.eventFees).values(values)
    .onConflictDoUpdate({ target: tables.eventFees.eventId, set: values }).returning()
  return row!
}

type Fees = NonNullable<Awaited<ReturnType<typeof feesOf>>>
type EntryRow = typeof tables.entries.$inferSelect

/** What an entry owes for a fee: the entry fee (the late one for an entry made after the date) or its claims'. */
export function amountDue(fees: Fees, entry: EntryRow, fee: 'entry' | 'record', timeZone: string) {
  if (fee === 'record') return { fee: 'record' as const, amountMinor: fees.recordMinor * entry.distanceIds.length }
  const made = localDateOf(entry.createdAt, timeZone)
  const late = fees.lateAfter !== null && fees.lateMinor !== null && made > fees.lateAfter
  return late
    ? { fee: 'late-entry' as const, amountMinor: fees.lateMinor! }
    : { fee: 'entry' as const, amountMinor: fees.entryMinor }
}
const localDateOf = (d: Date, timeZone: string) => d.toLocaleDateString('sv-SE', { timeZone })

/** Each entry's payments, newest first, and whether its entry fee stands paid (paid, not wholly refunded). */
export async function paymentsOf(entryIds: number[]) {
  if (!entryIds.length) return []
  return useDb().select().from(tables.payments).where(inArray(tables.payments.entryId, entryIds))
    .orderBy(desc(tables.payments.id))
}
export const entryFeePaid = (list: (typeof tables.payments.$inferSelect)[], entryId: number) => list.some(p =>
  p.entryId === entryId && p.fee !== 'record' && p.status === 'paid' && p.refundedMinor < p.amountMinor)

/** An entry may start a run where the organiser requires payment first only once its entry fee is paid. */
export async function refuseUnpaid(tx: Tx, entry: EntryRow) {
  const [fees] = await tx.select().from(tables.eventFees).where(eq(tables.eventFees.eventId, entry.eventId))
  if (!fees?.requirePayment) return
  const list = await tx.select().from(tables.payments).where(eq(tables.payments.entryId, entry.id))
  if (!entryFeePaid(list, entry.id)) {
    throw conflict('This entry\'s fee is not paid, and the organiser requires payment before a run')
  }
}

/**
 * A checkout at the provider for one fee of an entry: a pending payment row, then the hosted page the team
 * is sent to. The entry is never touched: a payment that fails leaves it as it was.
 */
export async function startCheckout(entryId: number, fee: 'entry' | 'record', userId: number, email: string) {
  const [row] = await useDb().select({ entry: tables.entries, event: tables.events }).from(tables.entries)
    .innerJoin(tables.events, eq(tables.events.id, tables.entries.eventId)).where(eq(tables.entries.id, entryId))
  if (!row) throw notFound('No such entry')
  const fees = await feesOf(row.event.id)
  if (!fees) throw conflict('The organiser has set no fees for this event')
  const paid = (await paymentsOf([entryId])).some(p =>
    (fee === 'record' ? p.fee === 'record' : p.fee !== 'record')
    && p.status === 'paid' && p.refundedMinor < p.amountMinor)
  if (paid) throw conflict('This fee is already paid')
  const due = amountDue(fees, row.entry, fee, row.event.timeZone)
  if (due.amountMinor <= 0) throw conflict('There is nothing to pay for this fee')
  const site = useRuntimeConfig().siteUrl.replace(/\/$/, '')
  const back = `${site}/events/${row.event.id}/entries`
  const session = await usePaymentProvider().checkout.sessions.create({
    mode: 'payment',
    line_items: [{
      quantity: 1,
      price_data: {
        currency: fees.currency,
        unit_amount: due.amountMinor,
        product_data: { name: `${feeName(due.fee)} · ${row.event.name} · entry #${entryId}` },
      },
    }],
    customer_email: email,
    client_reference_id: String(entryId),
    metadata: { entryId: String(entryId), fee: due.fee },
    success_url: `${back}?paid=${entryId}`,
    cancel_url: `${back}?cancelled=${entryId}`,
  })
  await useDb().insert(tables.payments).values({
    eventId: row.event.id, entryId, fee: due.fee, amountMinor: due.amountMinor, currency: fees.currency,
    providerSessionId: session.id, createdBy: userId,
  })
  return { url: session.url! }
}

export const feeName = (fee: string) =>
  ({ 'entry': 'Entry fee', 'late-entry': 'Late entry fee', 'record': 'Record application fee' }[fee] ?? fee)

/**
 * A webhook from the provider, checked with the SDK's own function (signature and its timestamp's age), taken
 * once per event id. Only it confirms a payment or a refund: the browser's return to the site proves nothing.
 */
export async function takeWebhook(raw: string, signature: string | undefined) {
  let event: Stripe.Event
  try {
    const secret = useRuntimeConfig().payments.webhookSecret
    event = usePaymentProvider().webhooks.constructEvent(raw, signature ?? '', secret)
  }
  catch {
    throw createError({ statusCode: 400, statusMessage: 'The signature does not hold, or is too old' })
  }
  const taken = await useDb().transaction(async (tx) => {
    const [fresh] = await tx.insert(tables.paymentEvents).values({ id: event.id, type: event.type })
      .onConflictDoNothing().returning()
    if (!fresh) return { taken: false, duplicate: true }
    const object = event.data.object as unknown as Record<string, unknown>
    const bySession = (status: 'paid' | 'failed' | 'cancelled', extra = {}) => tx.update(tables.payments)
      .set({ status, ...extra })
      .where(and(eq(tables.payments.providerSessionId, String(object.id)), eq(tables.payments.status, 'pending')))
      .returning()
    if (event.type === 'checkout.session.completed' && object.payment_status === 'paid') {
      const [p] = await bySession('paid', {
        providerPaymentId: String(object.payment_intent),
        paidAt: new Date(),
        receiptNo: sql`'R-' || lpad(id::text, 6, '0')`,
      })
      if (p) await mailReceipt(tx, p)
    }
    else if (event.type === 'checkout.session.async_payment_failed') await bySession('failed')
    else if (event.type === 'checkout.session.expired') await bySession('cancelled')
    else if (event.type === 'refund.updated' || event.type === 'charge.refunded') {
      const status = object.status === 'succeeded' ? 'succeeded' as const : 'failed' as const
      const [r] = await tx.update(tables.refunds).set({ status })
        .where(and(eq(tables.refunds.providerRefundId, String(object.id)), eq(tables.refunds.status, 'pending')))
        .returning()
      if (r?.status === 'succeeded') {
        const refunded = sql`${tables.payments.refundedMinor} + ${r.amountMinor}`
        await tx.update(tables.payments).set({ refundedMinor: refunded })
          .where(eq(tables.payments.id, r.paymentId))
      }
    }
    return { taken: true, duplicate: false }
  })
  // A receipt written with the payment goes out now, not at the next round of the outbox timer.
  if (taken.taken) deliver().catch(() => {})
  return taken
}

async function mailReceipt(tx: Tx, p: typeof tables.payments.$inferSelect) {
  const [who] = await tx.select({ email: tables.users.email, event: tables.events.name }).from(tables.users)
    .innerJoin(tables.events, eq(tables.events.id, p.eventId)).where(eq(tables.users.id, p.createdBy))
  const site = useRuntimeConfig().siteUrl.replace(/\/$/, '')
  await tx.insert(tables.mailOutbox).values({
    to: who!.email,
    subject: `Receipt ${p.receiptNo}: ${feeName(p.fee)}, ${who!.event}`,
    text: `Received with thanks: ${formatMoney(p.amountMinor, p.currency)}, ${feeName(p.fee).toLowerCase()} of entry `
      + `#${p.entryId} at ${who!.event}.\nReceipt ${p.receiptNo}, payment reference ${p.providerPaymentId}.\n`
      + `The receipt as a PDF: ${site}/api/payments/${p.id}/receipt.pdf\n`,
  })
}

/** A refund of a paid fee, partial or whole, with the organiser's reason; confirmed by the provider's webhook. */
export async function refundPayment(
  paymentId: number,
  input: { amountMinor?: number, reason: string },
  userId: number,
) {
  // One refund of a payment at a time, under a lock on it: what is left is counted with every refund before.
  return useDb().transaction(async (tx) => {
    const [p] = await tx.select().from(tables.payments).where(eq(tables.payments.id, paymentId)).for('update')
    if (!p) throw notFound('No such payment')
    if (p.status !== 'paid') throw conflict('Only a paid fee is refunded')
    const pending = await tx.select({ amount: tables.refunds.amountMinor }).from(tables.refunds)
      .where(and(eq(tables.refunds.paymentId, p.id), eq(tables.refunds.status, 'pending')))
    const left = p.amountMinor - p.refundedMinor - pending.reduce((t, r) => t + r.amount, 0)
    const amount = input.amountMinor ?? left
    if (amount <= 0 || amount > left) {
      throw fieldInvalid('amountMinor', `must be more than nothing and at most ${formatMoney(left, p.currency)}`)
    }
    const refund = await usePaymentProvider().refunds.create({
      payment_intent: p.providerPaymentId!, amount, metadata: { paymentId: String(p.id) },
    })
    const [row] = await tx.insert(tables.refunds).values({
      paymentId: p.id, amountMinor: amount, reason: input.reason, providerRefundId: refund.id, createdBy: userId,
    }).returning()
    return row!
  })
}

/** The organiser's view: every payment with its entry, refunds, and totals by fee. */
export async function paymentsAt(eventId: number) {
  const rows = await useDb().select({
    p: tables.payments, team: tables.teams.name, machine: tables.machines.name,
  }).from(tables.payments)
    .innerJoin(tables.entries, eq(tables.entries.id, tables.payments.entryId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .innerJoin(tables.machines, eq(tables.machines.id, tables.entries.machineId))
    .where(eq(tables.payments.eventId, eventId)).orderBy(desc(tables.payments.id))
  const refundRows = rows.length
    ? await useDb().select().from(tables.refunds).where(inArray(tables.refunds.paymentId, rows.map(r => r.p.id)))
    : []
  const totals: Record<string, { paidMinor: number, refundedMinor: number, count: number }> = {}
  for (const { p } of rows.filter(r => r.p.status === 'paid')) {
    const t = (totals[p.fee] ??= { paidMinor: 0, refundedMinor: 0, count: 0 })
    t.paidMinor += p.amountMinor
    t.refundedMinor += p.refundedMinor
    t.count++
  }
  return {
    payments: rows.map(r => ({
      ...r.p, team: r.team, machine: r.machine, refunds: refundRows.filter(x => x.paymentId === r.p.id),
    })),
    totals,
  }
}
