import { z } from 'zod'
import { CHECKLIST_IDS } from '../inspection/templates'
import { signSheetSchema } from './event-day'
import { decimalComma, numberOrRequired, recordId } from './fields'
import { decimalsOf, fromInput, MAX_DECIMAL_CHARS } from '../rules/exact'
import { BUS_KINDS, DECISIONS, ITEM_RESULTS, STREAMLINING } from '../constants'

const id = recordId

/** A measurement as typed: a decimal string or a JSON number, not negative, at most 6 decimals. */
const measuredValue = z
  .preprocess(decimalComma, z.union([z.number(), z.string().trim().max(MAX_DECIMAL_CHARS)],
    { error: 'must be a number' }))
  .superRefine((x, ctx) => {
    try {
      if (fromInput(x).n < 0n) ctx.addIssue({ code: 'custom', message: 'must not be negative' })
      else if (decimalsOf(x) > 6) ctx.addIssue({ code: 'custom', message: 'must have at most 6 decimals' })
    }
    catch {
      ctx.addIssue({ code: 'custom', message: 'must be a number' })
    }
  })

export const checklistAdaptSchema = z.object({
  baseId: z.enum(CHECKLIST_IDS as [string, ...string[]], { error: `must be one of ${CHECKLIST_IDS.join(', ')}` }),
  removeItems: z.array(z.string().max(80)).max(200).default([]),
  addItems: z
    .array(z.object({ section: z.string().trim().min(1).max(80), label: z.string().trim().min(3).max(300) }))
    .max(50)
    .default([]),
  /** For each safety item left out: the rulebook article that allows it (the copy then needs signing). */
  safetyRemovals: z
    .array(z.object({
      itemKey: z.string().max(80),
      reference: z.string().trim().min(3, { error: 'name the rulebook article that allows leaving it out' }).max(300),
    }))
    .max(50)
    .default([]),
  note: z.string().trim().min(3, { error: 'say which rulebook the adaptation follows' }).max(300),
})
export type ChecklistAdaptInput = z.infer<typeof checklistAdaptSchema>

export const startInspectionSchema = z
  .object({
    entryId: id,
    checklistId: id.optional(),
    baseId: z.enum(CHECKLIST_IDS as [string, ...string[]]).optional(),
  })
  .refine(x => !!x.checklistId !== !!x.baseId, {
    error: 'choose the event\'s checklist or a library template',
    path: ['checklistId'],
  })
export type StartInspectionInput = z.infer<typeof startInspectionSchema>

export const answerSchema = z.object({
  itemKey: z.string().min(1).max(60),
  result: z.enum(ITEM_RESULTS, { error: 'must be pass, fail or not applicable' }),
  /** A decimal as typed ("2.4", or a JSON number): converted exactly to the item's unit. */
  value: measuredValue.optional(),
  unit: z.string().max(8).optional(),
  note: z.string().trim().max(1000).optional(),
})
export type AnswerInput = z.infer<typeof answerSchema>

/**
 * The figures an inspection judges measurements against: the high-voltage bus's maximum working voltage
 * and kind (electric machines), the top speed the team declares, in km/h or mph, and the streamlining division
 * the scrutineer sees. Any of them may be sent alone; the bus's voltage and kind go together.
 */
export const figuresSchema = z
  .object({
    busVoltageV: z.coerce
      .number({ error: numberOrRequired })
      .positive({ error: 'must be greater than zero' })
      .max(2000, { error: 'must be at most 2000 V' })
      .optional(),
    busKind: z
      .enum(BUS_KINDS, { error: 'must be DC, AC, or DC and AC connected (with or without the AC protection)' })
      .optional(),
    declaredSpeed: measuredValue
      .refine(x => Number(x) > 0 && Number(x) <= 1500, { error: 'must be a speed above 0 and at most 1500' })
      .optional(),
    declaredUnit: z.enum(['km/h', 'mph'], { error: 'must be km/h or mph' }).default('km/h'),
    /** The streamlining division the scrutineer sees, confirming or correcting the team's declaration. */
    division: z.enum(STREAMLINING, { error: `must be one of ${STREAMLINING.join(', ')}` }).optional(),
  })
  .refine(x => (x.busVoltageV === undefined) === (x.busKind === undefined), {
    error: 'give the working voltage and the bus kind together',
    path: ['busKind'],
  })
  .refine(x => x.busVoltageV !== undefined || x.declaredSpeed !== undefined || x.division !== undefined, {
    error: 'give the working voltage and bus kind, the declared top speed, or the division seen',
    path: ['declaredSpeed'],
  })
export type FiguresInput = z.infer<typeof figuresSchema>

/** A drawn signature, as a PNG data URL, at most about 200 kB. */
export const drawing = z
  .string()
  .regex(/^data:image\/png;base64,[A-Za-z0-9+/=]+$/, { error: 'must be a PNG image' })
  .max(280_000)
  .optional()

export const signRecordSchema = signSheetSchema.extend({ drawingPng: drawing })
export type SignRecordInput = z.infer<typeof signRecordSchema>

/** The runs ticked as seen, each once, in order (what is signed does not depend on the order of the ticks). */
export const runIdsSeen = z.array(id).max(20, { error: 'at most 20 runs' }).default([])
  .transform(ids => [...new Set(ids)].sort((a, b) => a - b))

/**
 * A witness statement: the runs seen as ticks of the attempt's runs (`runIdsSeen`) and, apart, in the official's own
 * words (`runsSeen`, needed where nothing is ticked); never one written into the other.
 */
export const statementSchema = signRecordSchema.extend({
  attemptId: id,
  runIdsSeen: runIdsSeen,
  runsSeen: z.string().trim().max(500).default(''),
  position: z.string().trim().min(2, { error: 'say where you watched from' }).max(300),
  conditions: z.string().trim().min(2, { error: 'describe the conditions' }).max(1000),
  irregularities: z.string().trim().max(2000).default(''),
}).refine(x => x.runIdsSeen.length > 0 || x.runsSeen.length >= 2, {
  error: 'tick the runs you saw, or say which',
  path: ['runsSeen'],
})
export type StatementInput = z.infer<typeof statementSchema>

export const withdrawalSchema = signRecordSchema.extend({
  reason: z.string().trim().min(3, { error: 'say why the statement is withdrawn' }).max(1000),
})
export type WithdrawalInput = z.infer<typeof withdrawalSchema>

export const decisionSchema = signRecordSchema.extend({
  decision: z.enum(DECISIONS, { error: 'must be ratified or refused' }),
  reasons: z.string().trim().min(3, { error: 'give the reasons in writing' }).max(4000),
})
export type DecisionInput = z.infer<typeof decisionSchema>

/** A steward proposes setting a failing finding aside, signed, with the reason in writing. */
export const setAsideSchema = signSheetSchema.extend({
  code: z.string().trim().min(1, { error: 'name the finding' }).max(80),
  /** The run whose finding it is; absent for a finding of the pair or the attempt. */
  runId: id.nullable().default(null),
  reason: z.string().trim().min(10, { error: 'give the reason in writing (at least 10 characters)' }).max(2000),
})
export type SetAsideInput = z.infer<typeof setAsideSchema>

/** A scrutineer suspends a machine after an incident or a modification: signed, with the reason. */
export const suspensionSchema = signSheetSchema.extend({
  reason: z.string().trim().min(5, { error: 'say what happened (at least 5 characters)' }).max(1000),
})
export type SuspensionInput = z.infer<typeof suspensionSchema>

/** Text of one seal number per line (or separated by commas) as a list; a list as it is. */
const sealList = (v: unknown) => (typeof v === 'string' ? v.split(/[\n,;]/).map(s => s.trim()).filter(Boolean) : v)

/**
 * The post-run check after a record run: the mass re-measured (kg); the engine's capacity re-measured (cm³), which
 * the route asks for where the class goes by capacity; the impound seals' numbers as found and whether every one
 * was intact; what was seen; signed.
 */
export const postRunCheckSchema = signSheetSchema.extend({
  massKg: z.preprocess(decimalComma, z.coerce.number({ error: numberOrRequired }).positive().max(100_000)),
  capacityCm3: z.preprocess(
    v => (v === '' || v === null ? undefined : decimalComma(v)),
    z.coerce.number({ error: 'must be a number' }).positive({ error: 'must be greater than zero' }).max(100_000)
      .refine(x => Math.abs(x * 100 - Math.round(x * 100)) < 1e-6, { error: 'must have at most 2 decimals' })
      .optional(),
  ),
  sealNumbers: z.preprocess(sealList, z
    .array(z.string().trim().min(1).max(40, { error: 'a seal number is at most 40 characters' }))
    .max(50, { error: 'at most 50 seals' })
    .default([])),
  sealsIntact: z.boolean({ error: 'must be true or false' }).optional(),
  note: z.string().trim().max(1000).default(''),
})
export type PostRunCheckInput = z.infer<typeof postRunCheckSchema>

/** A ratification revoked by the function the profile names, with the reasons in writing, signed. */
export const revocationSchema = signSheetSchema.extend({
  reason: z.string().trim().min(10, { error: 'give the reasons in writing (at least 10 characters)' }).max(4000),
})
export type RevocationInput = z.infer<typeof revocationSchema>

/** The sanctioning body's homologation of a ratified record, as an official enters it. */
export const homologationSchema = signSheetSchema.extend({
  reference: z.string().trim().min(2, { error: 'give the sanctioning body\'s reference' }).max(120),
  homologatedOn: z.iso.date({ error: 'must be a date (YYYY-MM-DD)' }),
})
export type HomologationInput = z.infer<typeof homologationSchema>
