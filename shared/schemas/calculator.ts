import { z } from 'zod'
import { PROFILE_IDS } from '../rules/profiles'
import { isoDateTime, positiveDecimal, timeZoneName } from './fields'
import { DIRECTIONS, type Direction } from '../constants'
import type { Finding } from '../rules/findings'

export const calculatorRunSchema = z.object({
  direction: z.enum(DIRECTIONS, { error: 'must be "out" or "back"' }),
  startedAt: isoDateTime,
  elapsedS: positiveDecimal,
  /** The instant the run crossed the entry trap; its finish is then this plus the time over the distance. */
  entryAt: isoDateTime.optional(),
})
export type CalculatorRunInput = z.infer<typeof calculatorRunSchema>

export const calculatorRequestSchema = z
  .object({
    profile: z.enum(PROFILE_IDS, { error: `must be one of ${PROFILE_IDS.join(', ')}` }),
    distanceM: positiveDecimal,
    runs: z
      .array(calculatorRunSchema)
      .min(1, { error: 'needs at least one run' })
      .max(2, { error: 'takes at most two runs' }),
    recordKmh: positiveDecimal.optional(),
    recordMph: positiveDecimal.optional(),
    timeZone: timeZoneName.optional(),
  })
  .refine(x => x.recordKmh === undefined || x.recordMph === undefined, {
    error: 'give the standing record in km/h or in mph, not both',
    path: ['recordMph'],
  })
export type CalculatorRequestInput = z.infer<typeof calculatorRequestSchema>

export interface CalculatorResponse {
  profile: { id: string, version: number, name: string, decimals: number }
  runs: { direction: Direction, elapsedS: string, speedKmh: string, speedMph: string }[]
  meanTimeS: string | null
  resultKmh: string | null
  resultMph: string | null
  windowOk: boolean
  window: { rule: string, usedS: string | null, deadline: string | null, opens: string | null }
  /** No finding fails the profile, and nothing it turns on was left undecided. */
  valid: boolean
  /** What the calculator cannot decide from what it was given, in words (empty when it decides everything). */
  cannotDecide: string[]
  beatsRecord: boolean | null
  required: { figure: string, unit: string } | null
  returnTargetS: string | null
  findings: Finding[]
}
