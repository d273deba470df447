import { toFixed, type Q } from './exact'
import type { Finding } from './findings'
import type { RuleProfile, WindowAnchor } from './profile'
import { convertSpeed, type SpeedUnit } from './units'
import type { Direction } from '../constants'
import type { LeaveBy } from './leave-by'

export type { Direction }

export interface RunInput {
  direction: Direction
  /** The moment the run started, epoch milliseconds. */
  startedAtMs: number
  /** Time over the measured distance, seconds, exact. */
  elapsedS: Q
  /**
   * The instant the run left the measured distance (its last trap), epoch milliseconds, when the
   * readings give it. Without it the finish is estimated as the start plus the time over the distance,
   * which leaves out the run-up, and a finding says so.
   */
  finishedAtMs?: number
}

export interface AttemptInput {
  profile: RuleProfile
  distanceM: Q
  runs: RunInput[]
  /**
   * The standing record, or for a vacant class the minimum the organiser set (`minimum`): a first record
   * must reach the minimum itself, with no margin over it.
   */
  record?: { value: Q, unit: Exclude<SpeedUnit, 'm/s'>, minimum?: boolean }
  /** The event's time zone, for rules that count calendar days. */
  timeZone?: string
  /** Decimals of the return-run target time (the timing resolution); 3 unless told. */
  timeDecimals?: number
  /**
   * Where the profile has a qualifying run: the instant the machine checked into the impound after
   * it, epoch ms; null when none is recorded; left out where it is not tracked (the public calculator).
   */
  impoundCheckInMs?: number | null
}

export interface RunFigures {
  direction: Direction
  startedAtMs: number
  elapsedS: Q
  speedMs: Q
  kmh: string
  mph: string
}

export interface WindowState {
  ok: boolean
  rule: string
  /** For an elapsed window: the time used so far between the anchors (two runs). */
  usedS: Q | null
  /** Latest moment (epoch ms) for the closing anchor; null when it cannot be known yet. */
  deadlineMs: number | null
  /** Earliest moment the record run may start (next-day rules). */
  opensMs: number | null
  closingAnchor: WindowAnchor | null
}

export interface AttemptResult {
  runs: RunFigures[]
  meanTimeS: Q | null
  result: { speedMs: Q, kmh: string, mph: string } | null
  window: WindowState
  /** The smallest published figure that counts as a record, in the record's unit. */
  required: { value: Q, text: string, unit: string } | null
  /** True when no finding fails the profile: the one answer to "does this pair count". */
  valid: boolean
  /** True only for a valid result that meets the profile's improvement rule. */
  beatsRecord: boolean | null
  /** Whether the figure meets the improvement rule, valid or not (null without a record or a result). */
  meetsImprovement: boolean | null
  /** Latest impound check-in after the qualifying run, epoch ms, where it is tracked. */
  impoundDeadlineMs: number | null
  /** Longest return-run time that still gives a figure that counts, at timeDecimals. */
  returnTargetS: Q | null
  /** After one run: when the machine must leave the line for the return run, and what that rests on. */
  leaveBy: LeaveBy | null
  findings: Finding[]
}

type RuleKey = 'runs' | 'window' | 'averaging' | 'margin'

/** The rule a finding rests on, with the profile's source and certainty for it. */
export const ruleOf = (profile: RuleProfile, key: RuleKey, name: string, value: string) => ({
  name,
  value,
  source: profile[key].source,
  certainty: profile[key].certainty,
})

/** A speed as the profile publishes it: its decimals, truncated or rounded. */
export const publish = (profile: RuleProfile, v: Q, unit: SpeedUnit) =>
  toFixed(convertSpeed(v, 'm/s', unit), profile.figures.value.decimals, profile.figures.value.rounding)
