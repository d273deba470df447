import { z } from 'zod'

const text = z.string().trim().max(120).optional()

/** The public registry's filters and search; an empty value means any. */
export const recordBookQuerySchema = z.object({
  profile: text,
  class: text,
  distance: text,
  status: z.enum(['claimed', 'ratified', 'homologated', 'refused', 'withdrawn']).optional(),
  year: z.coerce.number().int().min(1900, { error: 'a year such as 2026' }).max(2999).optional(),
  q: text,
}).transform(q => Object.fromEntries(Object.entries(q).filter(([, v]) => v !== '' && v !== undefined)))
export type RecordBookQuery = z.infer<typeof recordBookQuerySchema> & {
  profile?: string
  class?: string
  distance?: string
  status?: string
  year?: number
  q?: string
}

/** The team withdraws a submitted claim before the officials decide. */
export const withdrawalSchema = z.object({
  reason: z.string().trim().min(10, { error: 'say why the claim is withdrawn (10 characters at least)' }).max(1000),
})
export type WithdrawalInput = z.infer<typeof withdrawalSchema>
