import { z } from 'zod'
import './messages'
import { CURRENCIES } from '../utils/money'
import { recordId } from './fields'

const minor = z.number({ error: 'must be an amount' }).int({ error: 'must be a whole number of cents' })
  .min(0, { error: 'must not be negative' }).max(100_000_000, { error: 'must be at most 1,000,000.00' })

/** The event's fees, as integer minor units of its currency. */
export const feesSchema = z.object({
  currency: z.enum(CURRENCIES, { error: `must be one of ${CURRENCIES.join(', ').toUpperCase()}` }),
  entryMinor: minor,
  recordMinor: minor.default(0),
  lateMinor: minor.nullable().default(null),
  lateAfter: z.iso.date({ error: 'must be a date, YYYY-MM-DD' }).nullable().default(null),
  requirePayment: z.boolean().default(false),
}).refine(x => (x.lateMinor === null) === (x.lateAfter === null), {
  error: 'give both the late fee and the date after which it applies, or neither',
  path: ['lateAfter'],
})
export type FeesInput = z.infer<typeof feesSchema>

/** Which fee a team pays now. */
export const checkoutSchema = z.object({
  fee: z.enum(['entry', 'record'], { error: 'must be the entry fee or the record fee' }),
})

/** A refund by the organiser: the amount (all that is left when absent) and why. */
export const refundSchema = z.object({
  amountMinor: minor.optional(),
  reason: z.string().trim().min(3, { error: 'say why (entry withdrawn, event cancelled…)' }).max(300),
})
export const paymentIdParams = z.object({ id: recordId })
