import { OFFICIAL_FUNCTION_LABELS, type Averaging, type OfficialFunction, type StartKind } from '../constants'
import type { Rounding } from './exact'
import type { RecordClass } from './classes'
import type { LicenceRule } from './start-line'
import { describeProtestRule, type ProtestRule } from './protests'

/** How sure we are of a rule value, always printed beside it. */
export type Certainty = 'seen' | 'from memory' | 'common practice' | 'not settled' | 'not known'

/** The number of appointed stewards who sign a decision of the stewards under this profile (one where it says none). */
export const stewardsQuorum = (profile: Pick<RuleProfile, 'stewards'>) => profile.stewards?.value.quorum ?? 1

/** Who may revoke a ratification under this profile (a steward where it says none). */
export const revokedByOf = (profile: Pick<RuleProfile, 'revokedBy'>): OfficialFunction =>
  profile.revokedBy?.value ?? 'steward'

/** A rule value with where it comes from. */
export interface Sourced<T> {
  value: T
  source: string
  certainty: Certainty
}

export type WindowAnchor = 'start-first' | 'finish-first' | 'start-second' | 'finish-second'

export type RunWindow
  = | { kind: 'elapsed', minutes: number, from: WindowAnchor, to: WindowAnchor }
  /**
   * The record run on the calendar day after the qualifying run, in the event's time zone; with
   * `before`, it must leave the line before that local time of day ("hh:mm"); with `overnightMinutes`, no sooner
   * than that long after the qualifying run left the line (an overnight impound, not minutes past midnight).
   */
    | { kind: 'next-day', before?: string, overnightMinutes?: number }

export interface MeasuredDistanceSpec {
  label: string
  metres: string // exact decimal
  start: StartKind
}

export interface MassClass {
  label: string
  /** Upper mass limit in kg, inclusive; null for the open class. */
  maxKg: number | null
}

export interface RuleProfile {
  id: string
  version: number
  name: string
  summary: string
  runs: Sourced<{ count: 2, directions: 'opposite' | 'same' }>
  window: Sourced<RunWindow>
  /** Informational: minutes within which a qualified machine goes into impound. */
  impoundMinutes: Sourced<number | null>
  averaging: Sourced<Averaging>
  figures: Sourced<{ decimals: number, rounding: Rounding }>
  /** The improvement needed over the standing record. */
  margin: Sourced<{ percent: number, inclusive: boolean }>
  gradientMaxPercent: Sourced<number | null>
  distances: Sourced<MeasuredDistanceSpec[]>
  /** The largest tail-wind component in m/s; null for no limit. */
  tailWindLimitMs: Sourced<number | null>
  bestPerDayOnly: Sourced<boolean | null>
  massClasses: Sourced<MassClass[] | null>
  witnessStatements: Sourced<number>
  /**
   * A qualifying run before the record run (club procedures): it must itself beat the standing record,
   * and an aborted record run means qualifying again. Null where the profile has no qualifying run.
   */
  qualifying: Sourced<{ mustBeatRecord: boolean, requalifyAfterAbort: boolean } | null>
  /** After a record run, the machine goes to a post-run check (mass re-measured, signed) before the dossier. */
  postRunCheck: Sourced<boolean>
  /**
   * The official functions someone must be appointed to before a dossier is issued (absent in copies frozen
   * before appointments were kept: none required).
   */
  appointments?: Sourced<OfficialFunction[]>
  /** The record classes an entry picks from (absent in copies frozen before classes were data). */
  classes?: Sourced<RecordClass[]>
  /** How riders are licensed and checked at the start line (absent in older copies: expiry only). */
  licence?: Sourced<LicenceRule>
  /** Whether a rider must have signed on to the latest riders' briefing before a run. */
  briefing?: Sourced<boolean>
  /** Protest deadline, fee and appeal path (absent in older copies: no protests). */
  protests?: Sourced<ProtestRule>
  /** How many appointed stewards sign a decision of the stewards (absent in older copies: one). */
  stewards?: Sourced<{ quorum: number }>
  /** The function whose holder may revoke a ratification, reopening the claim (absent in older copies: a steward). */
  revokedBy?: Sourced<OfficialFunction>
}

export const ruleLabels: Record<Exclude<keyof RuleProfile, 'id' | 'version' | 'name' | 'summary'>, string> = {
  runs: 'Runs',
  window: 'Time window',
  impoundMinutes: 'Impound after a qualifying run',
  averaging: 'Result',
  figures: 'Figures',
  margin: 'Improvement needed',
  gradientMaxPercent: 'Course gradient',
  distances: 'Distances',
  tailWindLimitMs: 'Tail-wind limit',
  bestPerDayOnly: 'Best result per day',
  massClasses: 'Mass classes',
  witnessStatements: 'Witness statements',
  qualifying: 'Qualifying run',
  postRunCheck: 'Post-run check',
  appointments: 'Officials appointed',
  classes: 'Classes',
  licence: 'Licences',
  briefing: 'Riders\' briefing',
  protests: 'Protests and appeals',
  stewards: 'Stewards\' decisions',
  revokedBy: 'Revoking a ratification',
}

export function describeWindow(w: RunWindow): string {
  if (w.kind === 'next-day') {
    const overnight = w.overnightMinutes ? `, at least ${w.overnightMinutes / 60} h after it` : ''
    return `record run on the calendar day after the qualifying run${overnight}`
      + `${w.before ? `, leaving before ${w.before}` : ''}`
  }
  const name: Record<WindowAnchor, string> = {
    'start-first': 'start of the first run',
    'finish-first': 'finish of the first run',
    'start-second': 'start of the second run',
    'finish-second': 'finish of the second run',
  }
  return `${w.minutes} min from the ${name[w.from]} to the ${name[w.to]}`
}

/** A rule value in words, as the rules page and the dossier print it. */
export function describeRuleValue(key: keyof typeof ruleLabels, value: unknown): string {
  if (value === null || value === undefined) return 'none'
  switch (key) {
    case 'window':
      return describeWindow(value as RunWindow)
    case 'distances':
      return (value as MeasuredDistanceSpec[]).map(d => `${d.label} (${d.metres} m)`).join('; ')
    case 'figures': {
      const f = value as { decimals: number, rounding: string }
      return `${f.decimals} decimals, ${f.rounding === 'truncate' ? 'truncated' : 'rounded'}`
    }
    case 'margin': {
      const m = value as { percent: number, inclusive: boolean }
      return m.percent ? `at least ${m.percent} % over the standing record` : 'exceed the standing record'
    }
    case 'runs': {
      const r = value as { count: number, directions: string }
      return `${r.count}, ${r.directions} directions`
    }
    case 'averaging':
      return value === 'mean-of-times' ? 'distance over the mean of the times' : 'mean of the speeds'
    case 'impoundMinutes':
      return `${value} min`
    case 'gradientMaxPercent':
      return `at most ${value} %`
    case 'tailWindLimitMs':
      return `at most ${value} m/s`
    case 'bestPerDayOnly':
      return value ? 'only the best result per class each day goes forward' : 'every result goes forward'
    case 'appointments':
      return (value as OfficialFunction[]).map(f => OFFICIAL_FUNCTION_LABELS[f]).join('; ') || 'none'
    case 'postRunCheck':
      return value ? 'the machine is checked again after the record run (mass re-measured), signed' : 'none'
    case 'qualifying': {
      const q = value as { mustBeatRecord: boolean, requalifyAfterAbort: boolean }
      return [
        q.mustBeatRecord ? 'the qualifying run must itself beat the standing record' : 'any qualifying run',
        q.requalifyAfterAbort ? 'an aborted record run means qualifying again' : '',
      ].filter(Boolean).join('; ')
    }
    case 'classes': {
      const list = value as RecordClass[]
      return `${list.length} classes: ${list.map(c => c.label).join('; ')}`
    }
    case 'licence': {
      const l = value as LicenceRule
      const grades = l.grades?.length
        ? `graded by speed: ${l.grades
          .map(g => `${g.label}${g.maxKmh === null ? ' (no limit)' : ` (to ${g.maxKmh} km/h)`}`)
          .join('; ')}; an upgrade run goes one grade up`
        : 'a licence valid on the day of the run'
      return `${grades}${l.medical ? '; a valid medical' : ''}`
    }
    case 'briefing':
      return value ? 'each rider signs on to the latest briefing before running' : 'not required'
    case 'protests':
      return describeProtestRule(value as ProtestRule)
    case 'revokedBy':
      return `signed by the appointed ${OFFICIAL_FUNCTION_LABELS[value as OfficialFunction].toLowerCase()}, `
        + 'with reasons'
    case 'stewards': {
      const { quorum } = value as { quorum: number }
      return quorum === 1 ? 'signed by an appointed steward' : `signed by ${quorum} appointed stewards`
    }
    case 'massClasses':
      return (value as MassClass[]).map(c => `${c.label}${c.maxKg ? ` (up to ${c.maxKg} kg)` : ''}`).join('; ')
    default:
      return String(value)
  }
}
