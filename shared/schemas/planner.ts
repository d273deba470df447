import { z } from 'zod'
import './messages'
import { PROFILE_IDS } from '../rules/profiles'
import { numberOrRequired, recordId } from './fields'

/** A number (from JSON or a form's text) within a range, named in the error. */
const num = (min: number, max: number) => z.preprocess(
  v => (typeof v === 'string' && v.trim() !== '' ? Number(v.replace(',', '.')) : v),
  z.number({ error: numberOrRequired }).finite({ error: 'must be a number' })
    .min(min, { error: `must be at least ${min}` }).max(max, { error: `must be at most ${max}` }),
)
/** As `num`, or empty for "not given". */
const optionalNum = (min: number, max: number) => z.preprocess(v => (v === '' ? null : v), num(min, max).nullable())

const power = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('constant'), kW: num(0.1, 100_000) }),
  z.object({
    kind: z.literal('curve'),
    points: z.array(z.object({ kmh: num(0, 2000), kW: num(0, 100_000) }))
      .min(2, { error: 'give at least two points of the curve' }).max(50)
      .refine(p => p.every((x, i) => i === 0 || x.kmh > p[i - 1]!.kmh),
        { error: 'speeds must rise from point to point' }),
  }),
], { error: 'choose a constant power or a curve' })

/** Everything a plan is computed from: the team's figures, the day's air, the course and the rules. */
export const planInputSchema = z.object({
  machine: z.object({
    massKg: num(1, 20_000),
    rotatingMassKg: num(0, 5000).default(0),
    cdA: num(0.01, 20),
    crr: num(0, 0.1),
    efficiency: num(0.1, 1),
    power,
    maxTractiveN: num(1, 1_000_000),
  }),
  conditions: z.object({
    altitudeM: num(-400, 5000),
    temperatureC: optionalNum(-40, 60).default(null),
    pressureHpa: optionalNum(500, 1100).default(null),
    windMs: num(0, 30).default(0),
    windFromDeg: num(0, 360).default(0),
  }),
  course: z.object({
    label: z.string().trim().min(1, { error: 'name the measured distance' }).max(80),
    lengthM: num(100, 50_000),
    headingDeg: num(0, 360).default(0),
    entryM: num(0, 50_000),
    exitM: num(1, 50_000),
    /** Other measured distances timed on the same passes, m from the start line. */
    others: z.array(z.object({
      label: z.string().trim().min(1).max(80), entryM: num(0, 50_000), exitM: num(1, 50_000),
    })).max(8).default([]),
  }).refine(c => c.exitM > c.entryM, { error: 'must lie past the entry trap', path: ['exitM'] })
    .refine(c => c.exitM < c.lengthM, { error: 'must lie inside the course', path: ['exitM'] })
    .refine(c => c.others.every(o => o.exitM > o.entryM && o.exitM < c.lengthM),
      { error: 'each other distance must lie inside the course, its exit past its entry', path: ['others'] }),
  shutdown: z.object({
    decelerationMs2: num(0.5, 15),
    marginM: num(0, 10_000).default(0),
  }),
  profileId: z.enum(PROFILE_IDS, { error: 'choose a rule profile' }),
  recordKmh: optionalNum(1, 2000).default(null),
  turnaroundMin: num(0, 24 * 60).default(0),
})
export type PlanRequest = z.infer<typeof planInputSchema>

/** A plan saved for a team (and one of its machines), private to the team. */
export const savedPlanSchema = z.object({
  teamId: recordId,
  machineId: recordId.optional().nullable(),
  name: z.string().trim().min(2, { error: 'name the plan' }).max(120),
  input: planInputSchema,
})
export type SavedPlanInput = z.infer<typeof savedPlanSchema>

export const comparisonQuerySchema = z.object({ attemptId: recordId })
