import type { Certainty } from './profile'

export type Severity = 'fail' | 'warn' | 'info'

/** The stewards' signed decision that a failing finding does not stop the result, with the reason and their names. */
export interface SetAside {
  id: number
  by: string
  at: string
  reason: string
}

/** A problem or note about a run or attempt, with the rule value and its source where one applies. */
export interface Finding {
  code: string
  severity: Severity
  message: string
  rule?: { name: string, value: string, source: string, certainty: Certainty }
  /** Present when an official has set the failing finding aside in writing. */
  setAside?: SetAside
}

/**
 * Who may set a failing finding aside: nobody (a condition of a record), the appointed stewards together, or the
 * appointed chief timekeeper alone, explaining in writing a gap in the timing evidence.
 */
export type SetAsideAuthority = 'never' | 'stewards' | 'chief-timekeeper'

export interface SetAsideRule {
  /** Finding codes: an exact code, or a family written with its trailing dot ('licence.'). */
  codes: string[]
  authority: SetAsideAuthority
  /** Why, as the person asking is told. */
  why: string
  source: string
  certainty: Certainty
}

/**
 * Who may set aside what, by finding kind. The conditions of a record are never set aside by anyone at the event:
 * the runs' directions, order and window, the course as surveyed and its gradient, the tail wind, the rider's
 * licence at the run, the machine's class, the club's qualifier and impound, and the arithmetic of the record. A
 * reading that cannot be right is corrected (an appended correction with its reason), not waived. What remains is
 * a disagreement of evidence the stewards may resolve in writing, together (the profile's quorum, each signing).
 */
export const SET_ASIDE_RULES: SetAsideRule[] = [
  {
    codes: ['pair.direction', 'pair.overlap', 'window.exceeded'],
    authority: 'never',
    why: 'the runs themselves are a condition of the record: their directions, order and time window are set by '
      + 'the rules, not by a decision at the event',
    source: 'record rules set the runs (two, in the directions the profile names) within the time window; see '
      + 'the profile\'s runs and window rules and their sources (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['course.'],
    authority: 'never',
    why: 'the course is a condition of the record: a measured distance shorter than nominal or off its survey, or a '
      + 'gradient over the limit, is not the course the record is for',
    source: 'a record is set over a surveyed distance within the gradient limit; see the profile\'s gradient rule '
      + 'and its source (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['wind.tail-over-limit'],
    authority: 'never',
    why: 'a tail wind over the limit assisted the run: the limit is a condition of the record',
    source: 'the profile\'s tail-wind limit and its source (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['rider.', 'licence.'],
    authority: 'never',
    why: 'a rider\'s licence valid at the run is a condition of the record; the clerk of the course may let a '
      + 'machine start, but that does not make the run count',
    source: 'the profile\'s licence rule and its source (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['class.'],
    authority: 'never',
    why: 'the machine fits its class as the scrutineer measured it; a new inspection decides, not a set-aside',
    source: 'the profile\'s classes and their source (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['impound.', 'qualifier.'],
    authority: 'never',
    why: 'the qualifying run and the impound after it are conditions of the record run in the club procedure',
    source: 'the profile\'s qualifying and impound rules and their sources (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['record.', 'return.'],
    authority: 'never',
    why: 'whether the result beats the record is arithmetic, not judgement',
    source: 'the profile\'s improvement rule and its source (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['reading.'],
    authority: 'never',
    why: 'a reading that cannot be right is corrected by the timekeeper (an appended correction with its reason), '
      + 'never waived',
    source: 'timing corrections are made in writing, the original kept (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['protest.'],
    authority: 'never',
    why: 'the stewards\' decision on a protest stands until the appeal body decides otherwise; it is not set aside',
    source: 'a decision on a protest is open to appeal only (common practice of sporting codes)',
    certainty: 'common practice',
  },
  {
    codes: ['timing.single-system'],
    authority: 'chief-timekeeper',
    why: 'a run timed by one system only stands on that system once the chief timekeeper has written why the other '
      + 'has no time (a beam missed, a printer jammed)',
    source: 'two independent timing systems time every run, and the chief timekeeper accounts in writing for a '
      + 'time one of them lacks (common practice)',
    certainty: 'common practice',
  },
  {
    codes: ['timing.cross-check'],
    authority: 'stewards',
    why: 'a disagreement between the two timing systems beyond their tolerances may be resolved in writing by the '
      + 'stewards, who say which system they rely on and why',
    source: 'the stewards decide on matters of the timing put to them, in writing (common practice; confirm in the '
      + 'sporting code in force)',
    certainty: 'common practice',
  },
]

/** The rule for a finding\'s code: the exact code first, then its family; a code not listed is never set aside. */
export function setAsideRule(code: string): SetAsideRule {
  const exact = SET_ASIDE_RULES.find(r => r.codes.includes(code))
  const family = SET_ASIDE_RULES.find(r => r.codes.some(c => c.endsWith('.') && code.startsWith(c)))
  return exact ?? family ?? {
    codes: [code],
    authority: 'never',
    why: 'no rule lets this finding be set aside',
    source: 'a finding no rule lists is a condition of the record until one does (common practice)',
    certainty: 'common practice',
  }
}

/** Whether anyone may set a finding aside: a failing finding a rule gives to the stewards or the chief timekeeper. */
export const mayBeSetAside = (f: Pick<Finding, 'code' | 'severity'>) =>
  f.severity === 'fail' && setAsideRule(f.code).authority !== 'never'

/** How many sign a set-aside of this finding: the stewards' quorum, or the chief timekeeper alone. */
export const setAsideQuorum = (code: string, stewardsQuorum: number) =>
  setAsideRule(code).authority === 'chief-timekeeper' ? 1 : stewardsQuorum

/** A finding that stops the result: failing and not set aside. */
export const blocks = (f: Finding) => f.severity === 'fail' && !f.setAside

/** The findings with the set-asides that apply to them (same code, same run or both of the attempt). */
export function withSetAsides<F extends Finding>(
  findings: F[],
  runId: number | null,
  setAsides: (SetAside & { code: string, runId: number | null })[],
): F[] {
  return findings.map((f) => {
    if (!mayBeSetAside(f)) return f
    const s = setAsides.find(x => x.code === f.code && x.runId === runId)
    return s ? { ...f, setAside: { id: s.id, by: s.by, at: s.at, reason: s.reason } } : f
  })
}
