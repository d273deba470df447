import { z } from 'zod'
import './messages'
import { CLAIM_STATUSES } from '../constants'

/** An empty filter means any. */
const any = <S extends z.ZodType>(s: S) => z.preprocess(v => (v === '' ? undefined : v), s.optional())
const text = any(z.string().trim().max(120))

/** The public registry's filters and search. */
export const recordBookQuerySchema = z.object({
  profile: text,
  class: text,
  distance: text,
  status: any(z.enum(CLAIM_STATUSES)),
  year: any(z.coerce.number().int().min(1900, { error: 'a year such as 2026' }).max(2999)),
  q: text,
})
export type RecordBookQuery = z.infer<typeof recordBookQuerySchema>

/** The team withdraws a submitted claim before the officials decide. */
export const withdrawalSchema = z.object({
  reason: z.string().trim().min(10, { error: 'say why the claim is withdrawn (10 characters at least)' }).max(1000),
})
export type WithdrawalInput = z.infer<typeof withdrawalSchema>
