import { z } from 'zod'
import './messages'
import { signSheetSchema } from './event-day'
import { isoDateTime, recordId } from './fields'
import { PROTEST_KINDS, PROTEST_OUTCOMES, PROTEST_VOIDS } from '../rules/protests'

/** A team's protest against what was published about an attempt, signed by the person who lodges it. */
export const protestSchema = signSheetSchema.extend({
  attemptId: recordId,
  kind: z.enum(PROTEST_KINDS, { error: 'say what the protest is against' }),
  grounds: z.string().trim().min(10, { error: 'state the grounds (at least a sentence)' }).max(4000),
})
export type ProtestInput = z.infer<typeof protestSchema>

/** An appeal against the stewards' decision on a protest, by a party to it. */
export const appealSchema = signSheetSchema.extend({
  grounds: z.string().trim().min(10, { error: 'state the grounds of the appeal' }).max(4000),
})
export type AppealInput = z.infer<typeof appealSchema>

/** The hearing and the decision, with reasons, signed by a steward (or, on an appeal, the official recording it). */
export const protestDecisionSchema = signSheetSchema.extend({
  heardAt: isoDateTime,
  present: z.string().trim().min(2, { error: 'say who was heard or present' }).max(1000),
  hearing: z.string().trim().min(3, { error: 'summarise the hearing' }).max(4000),
  outcome: z.enum(PROTEST_OUTCOMES, { error: 'say whether the protest is upheld or dismissed' }),
  reasons: z.string().trim().min(10, { error: 'give the reasons for the decision' }).max(4000),
  /** What an upheld decision makes void; a dismissed one voids nothing. */
  voids: z.enum(PROTEST_VOIDS, { error: 'say what the decision makes void' }).default('nothing'),
  voidRunId: recordId.nullable().default(null),
})
  .refine(x => x.outcome === 'upheld' || x.voids === 'nothing', {
    error: 'a dismissed protest makes nothing void', path: ['voids'],
  })
  .refine(x => (x.voids === 'run') === (x.voidRunId !== null), {
    error: 'name the run made void (and only when a run is)', path: ['voidRunId'],
  })
export type ProtestDecisionInput = z.infer<typeof protestDecisionSchema>
