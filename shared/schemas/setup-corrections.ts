import { z } from 'zod'
import './messages'
import { distanceSchema, standingRecordSchema, timingSystemSchema, trapSchema } from './event-day'

/** The set-up items the organiser corrects or retires, as they are named in the routes. */
export const SETUP_KINDS = ['traps', 'distances', 'timing-systems', 'records'] as const
export type SetupKind = (typeof SETUP_KINDS)[number]

const reason = z.string().trim().min(3, { error: 'say why (kept in the set-up history)' }).max(500)

/** A correction: the item's whole form, as when it was added, and the reason. */
export const setupCorrectionSchemas = {
  'traps': trapSchema.safeExtend({ reason }),
  'distances': distanceSchema.safeExtend({ reason }),
  'timing-systems': timingSystemSchema.safeExtend({ reason }),
  'records': standingRecordSchema.safeExtend({ reason }),
} as const

export const retireSchema = z.object({ reason })
export const setupItemParams = z.object({
  id: z.coerce.number().int().positive(),
  kind: z.enum(SETUP_KINDS, { error: 'must be traps, distances, timing-systems or records' }),
  itemId: z.coerce.number().int().positive(),
})
