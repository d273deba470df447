import { z } from 'zod'
import { decimalsOf, fromDecimal } from '../rules/exact'
import { PROFILE_IDS } from '../rules/profiles'
import { decimalComma, isoDateTime, recordId } from './fields'
import { TIME_OF_DAY, TIME_OF_DAY_ERROR } from '../rules/timing'
import {
  AVERAGINGS,
  DIRECTIONS,
  POWER_SOURCES,
  RECORD_UNITS,
  START_KINDS,
  STREAMLINING,
  SYSTEM_ROLES,
  TIME_BASES,
} from '../constants'

/** An exact decimal, as a string or a number, with at most `maxDecimals` places and an optional floor. */
export const decimalText = (maxDecimals: number, opts: { min?: number, max?: number } = {}) =>
  z
    .preprocess(decimalComma, z.union([z.string(), z.number()]))
    .transform(String)
    .superRefine((s, ctx) => {
      let v
      try {
        v = fromDecimal(s)
      }
      catch (e) {
        const message = e instanceof RangeError ? `must be ${e.message}` : 'must be a decimal number'
        ctx.addIssue({ code: 'custom', message })
        return
      }
      if (decimalsOf(s) > maxDecimals) ctx.addIssue({ code: 'custom', message: `at most ${maxDecimals} decimals` })
      const n = Number(v.n) / Number(v.d)
      if (opts.min !== undefined && n < opts.min)
        ctx.addIssue({ code: 'custom', message: `must be at least ${opts.min}` })
      if (opts.max !== undefined && n > opts.max)
        ctx.addIssue({ code: 'custom', message: `must be at most ${opts.max}` })
    })

const id = recordId
const label = z.string().trim().min(1, { error: 'is required' }).max(40)
const day = z.iso.date({ error: 'must be a date, YYYY-MM-DD' })
/** A time of day read at a trap: HH:MM:SS with a fraction, e.g. 10:15:02.123 (or with a comma, 10:15:02,123). */
export const timeOfDay = z.string().trim().transform(s => s.replace(/^(\d{1,2}:\d{2}:\d{2}),(\d+)$/, '$1.$2'))
  .pipe(z.string().regex(TIME_OF_DAY, { error: TIME_OF_DAY_ERROR }))

export const courseSchema = z.object({
  name: z.string().trim().min(2).max(80),
  headingDeg: decimalText(2, { min: 0, max: 359.99 }),
  surface: z.string().trim().min(2).max(80),
  surveyToleranceMm: z.coerce.number().int().min(1, { error: 'must be at least 1 mm' }).max(1000),
})
export type CourseInput = z.infer<typeof courseSchema>

export const trapSchema = z.object({
  courseId: id,
  label,
  positionM: decimalText(3, { min: 0, max: 100_000 }),
  elevationM: decimalText(3, { min: -500, max: 9000 }),
})
export type TrapInput = z.infer<typeof trapSchema>

export const distanceSchema = z
  .object({
    courseId: id,
    label,
    start: z.enum(START_KINDS),
    nominalM: decimalText(3, { min: 1, max: 100_000 }),
    entryTrapId: id,
    exitTrapId: id,
  })
  .refine(x => x.entryTrapId !== x.exitTrapId, { error: 'must differ from the entry trap', path: ['exitTrapId'] })
export type DistanceInput = z.infer<typeof distanceSchema>

export const RESOLUTIONS = [100, 1000, 10_000, 100_000, 1_000_000] as const
export const timingSystemSchema = z
  .object({
    name: z.string().trim().min(2).max(80),
    role: z.enum(SYSTEM_ROLES),
    ticksPerSecond: z.coerce
      .number()
      .refine(n => (RESOLUTIONS as readonly number[]).includes(n), {
        error: 'must be 100, 1000, 10000, 100000 or 1000000 ticks per second',
      }),
    description: z.string().trim().max(500).default(''),
    toleranceS: decimalText(6, { min: 0, max: 1 }),
    calibratedOn: day,
    calibrationExpires: day,
    timeBase: z.enum(TIME_BASES, { error: 'must be the event\'s local time or UTC' }).default('local'),
    synchronisation: z.string().trim().max(200).default(''),
  })
  .refine(x => x.calibrationExpires > x.calibratedOn, {
    error: 'must be after the calibration date',
    path: ['calibrationExpires'],
  })
export type TimingSystemInput = z.infer<typeof timingSystemSchema>

export const standingRecordSchema = z.object({
  className: z.string().trim().min(1).max(80),
  distanceLabel: z.string().trim().min(1).max(40),
  /** The record as published, in its own unit. */
  speed: decimalText(3, { min: 0.001, max: 2000 }),
  unit: z.enum(RECORD_UNITS, { error: 'must be km/h or mph' }),
  setOn: day.optional(),
  note: z.string().trim().max(300).default(''),
  /** A minimum for a vacant class (a first record must reach it), not a record. */
  minimum: z.preprocess(v => (v === 'true' ? true : v === 'false' || v === '' ? false : v), z.boolean().default(false)),
})
export type StandingRecordInput = z.infer<typeof standingRecordSchema>

/** A class limit: over `over` (exclusive), up to `upTo` (inclusive; null for no upper limit). */
const classRange = z.object({
  over: z.number().min(0).max(100_000),
  upTo: z.number().positive().max(100_000).nullable(),
})

/** The event's class list changed on its own: classes left out and added, with the rulebook they follow. */
export const classesAdaptSchema = z.object({
  removeClasses: z.array(z.string().trim().max(120)).max(200).default([]),
  addClasses: z
    .array(z.object({
      label: z.string().trim().min(3, { error: 'name the class' }).max(120),
      propulsion: z.enum(POWER_SOURCES, { error: `must be one of ${POWER_SOURCES.join(', ')}` }),
      division: z.enum(['none', 'partial', 'full']).optional(),
      capacityCm3: classRange.optional(),
      massKg: classRange.optional(),
    }))
    .max(100)
    .default([]),
  source: z
    .string()
    .trim()
    .min(3, { error: 'say where the class list comes from (rulebook and article)' })
    .max(300),
})
export type ClassesAdaptInput = z.infer<typeof classesAdaptSchema>

export const profileAdaptSchema = z.object({
  baseId: z.enum(PROFILE_IDS),
  windowMinutes: z.coerce
    .number()
    .int()
    .min(1)
    .max(24 * 60)
    .optional(),
  marginPercent: z.preprocess(decimalComma, z.coerce.number().min(0).max(10).optional()),
  tailWindLimitMs: z.preprocess(decimalComma, z.coerce.number().min(0).max(20).nullable().optional()),
  witnessStatements: z.coerce.number().int().min(0).max(10).optional(),
  averaging: z.enum(AVERAGINGS).optional(),
  /** true or false, from JSON or from a form's "true"/"false". */
  postRunCheck: z.preprocess(v => (v === 'true' ? true : v === 'false' ? false : v), z.boolean().optional()),
  /** Protests within so many minutes of publication, or by a clock time ("hh:mm") the same day. */
  protestMinutes: z.coerce.number().int().min(1).max(24 * 60).optional(),
  protestBy: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'must be a time of day, hh:mm' }).optional(),
  /** An appeal within so many minutes of the stewards' decision. */
  appealMinutes: z.coerce.number().int().min(1).max(14 * 24 * 60).optional(),
  /** Classes of the base profile the event leaves out (by label), and classes it adds. */
  removeClasses: classesAdaptSchema.shape.removeClasses,
  addClasses: classesAdaptSchema.shape.addClasses,
  source: z
    .string()
    .trim()
    .min(3, { error: 'say where the adapted values come from (rulebook and article)' })
    .max(300),
})
export type ProfileAdaptInput = z.infer<typeof profileAdaptSchema>

/** A rider as entered: the licence, its grade where the profile grades licences, and the medical's validity. */
export const riderSchema = z.object({
  name: z.string().trim().min(2).max(80),
  licenceNo: z.string().trim().min(2).max(40),
  licenceExpires: day,
  licenceGrade: z.string().trim().max(40).nullish().transform(x => x || null),
  medicalExpires: day.optional().nullable().transform(x => x ?? null),
})

/** What a team corrects in its entry: the rider and the machine as entered. */
export const entryDetailsSchema = z.object({
  rider: riderSchema,
  machine: z.object({
    name: z.string().trim().min(2).max(80),
    power: z.enum(POWER_SOURCES),
    declaredMassKg: decimalText(1, { min: 1, max: 20_000 }),
    division: z.enum(STREAMLINING),
  }),
  /** Why; required once the entry has run (the organiser reads it before approving). */
  reason: z.string().trim().max(500).default(''),
})
export type EntryDetailsInput = z.infer<typeof entryDetailsSchema>
export const changeDecisionSchema = z.object({
  approve: z.boolean({ error: 'say whether the change is approved' }),
  note: z.string().trim().max(500).default(''),
})
export type ChangeDecisionInput = z.infer<typeof changeDecisionSchema>

export const entrySchema = z
  .object({
    machine: z
      .object({
        name: z.string().trim().min(2).max(80),
        power: z.enum(POWER_SOURCES),
        declaredMassKg: decimalText(1, { min: 1, max: 20_000 }),
        division: z.enum(STREAMLINING),
      })
      .optional(),
    machineId: id.optional(),
    rider: riderSchema.optional(),
    riderId: id.optional(),
    className: z.string().trim().min(1).max(80),
    /** The measured distances the entry claims, timed on the same passes (the first is its main claim). */
    distanceIds: z.array(id).min(1, { error: 'claim at least one measured distance' }).max(8).optional(),
    /** One distance, as before several could be claimed. */
    distanceId: id.optional(),
  })
  .refine(x => !!x.distanceIds !== (x.distanceId !== undefined), {
    error: 'claim at least one measured distance',
    path: ['distanceIds'],
  })
  .refine(x => !!x.machine !== !!x.machineId, {
    error: 'give a new machine or pick one already entered',
    path: ['machine'],
  })
  .refine(x => !!x.rider !== !!x.riderId, {
    error: 'give a new rider or pick one already entered',
    path: ['rider'],
  })
export type EntryInput = z.infer<typeof entrySchema>

/** A run leaves the line now, by the server's clock, unless the instant it left is given. */
export const startRunSchema = z.object({
  entryId: id,
  direction: z.enum(DIRECTIONS),
  /** A flying pass, or a standing start from rest at the start line; by default what the entry's claims take. */
  start: z.enum(START_KINDS).optional(),
  startedAt: isoDateTime.optional(),
  /** The speed the run expects, km/h, for the licence grade's check; else the speed declared at inspection. */
  expectedKmh: z.preprocess(decimalComma, z.coerce.number().positive().max(2000).optional()),
  /** A licence upgrade run into the next grade, where the profile grades licences. */
  licenceUpgrade: z.boolean().default(false),
})
export type StartRunInput = z.infer<typeof startRunSchema>
export const readingSchema = z.object({ trapId: id, systemId: id, time: timeOfDay })
export type ReadingInput = z.infer<typeof readingSchema>
export const correctionSchema = z.object({
  time: timeOfDay,
  reason: z.string().trim().min(3, { error: 'say why the time is corrected' }).max(300),
  expectedCurrentId: recordId,
})
export type CorrectionInput = z.infer<typeof correctionSchema>
export const abortSchema = z.object({
  reason: z.string().trim().min(3, { error: 'say why the run is aborted' }).max(300),
})
export type AbortInput = z.infer<typeof abortSchema>
/** The machine into impound after its qualifying run: now by the server's clock, or the instant given. */
export const impoundSchema = z.object({
  checkedInAt: isoDateTime.optional(),
  note: z.string().trim().max(300).default(''),
})
export type ImpoundInput = z.infer<typeof impoundSchema>
export const weatherSchema = z.object({
  windSpeedMs: decimalText(2, { min: 0, max: 60 }),
  windFromDeg: decimalText(2, { min: 0, max: 360 }),
  temperatureC: decimalText(1, { min: -40, max: 70 }).optional(),
  pressureHpa: decimalText(1, { min: 500, max: 1100 }).optional(),
})
export type WeatherInput = z.infer<typeof weatherSchema>
/** Base64url text of a passkey's answer. */
const base64url = z.string().regex(/^[A-Za-z0-9_-]*$/, { error: 'must be base64url' }).max(20_000)

/** A passkey's answer to a signing challenge (a WebAuthn assertion as the browser library returns it). */
export const passkeyResponseSchema = z.object({
  id: base64url.min(1),
  rawId: base64url.min(1),
  type: z.literal('public-key'),
  response: z.object({
    authenticatorData: base64url.min(1),
    clientDataJSON: base64url.min(1),
    signature: base64url.min(1),
    userHandle: base64url.optional(),
  }),
  clientExtensionResults: z.record(z.string(), z.unknown()).default({}),
  authenticatorAttachment: z.enum(['platform', 'cross-platform']).optional(),
})

/**
 * A signature: the typed name, and the proof that it is the signer: a passkey's answer over the content,
 * or the password again (the weaker kind; asked for when no passkey is given).
 */
export const signSheetSchema = z.object({
  password: z.string().max(200).optional(),
  passkey: passkeyResponseSchema.optional(),
  typedName: z.string().trim().min(2, { error: 'type your full name' }).max(120),
  /** Why the typed name differs from the name on the signer's account, where it does. */
  nameNote: z.string().trim().max(200).optional(),
  reason: z.string().trim().max(300).optional(),
})
export type SignSheetInput = z.infer<typeof signSheetSchema>
export const reopenSheetSchema = signSheetSchema.extend({
  reason: z.string().trim().min(3, { error: 'say why the signed sheet is reopened' }).max(300),
})
export type ReopenSheetInput = z.infer<typeof reopenSheetSchema>

export const csvImportSchema = z.object({
  csv: z.string().min(1, { error: 'the file is empty' }).max(1_000_000, { error: 'the file is over 1 MB' }),
  columns: z.object({
    run: z.string().min(1).max(80),
    trap: z.string().min(1).max(80),
    time: z.string().min(1).max(80),
    system: z.string().min(1).max(80).optional(),
  }),
  systemId: id.optional(),
  commit: z.boolean().default(false),
})
export type CsvImportInput = z.infer<typeof csvImportSchema>

export const idParams = z.object({ id })

/** Which claimed distance of an attempt a readiness check or a dossier is about; by default its first. */
export const claimedDistanceSchema = z.object({ distanceId: id.optional() })
export type ClaimedDistanceInput = z.infer<typeof claimedDistanceSchema>
