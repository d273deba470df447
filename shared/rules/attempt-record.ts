import { add, ceilTo, cmp, div, floorTo, isPositive, mul, q, sub, toFixed, type Q } from './exact'
import type { Finding } from './findings'
import type { RuleProfile } from './profile'
import { ruleOf, type AttemptInput, type AttemptResult, type RunFigures } from './attempt-types'
import { convertSpeed } from './units'

type StandingRecord = NonNullable<AttemptInput['record']>

/** The smallest exact speed (m/s) whose published figure counts against the record. */
function thresholdSpeed(profile: RuleProfile, record: StandingRecord) {
  const { decimals, rounding } = profile.figures.value
  // A vacant class's minimum is reached, not exceeded by a margin (common practice, not settled).
  const { percent, inclusive } = record.minimum ? { percent: 0, inclusive: true } : profile.margin.value
  const needed = mul(record.value, add(q(1n), div(q(BigInt(Math.round(percent * 1e6))), q(100_000_000n))))
  const ulp = q(1n, 10n ** BigInt(decimals))
  const figure = inclusive ? ceilTo(needed, decimals) : add(floorTo(needed, decimals), ulp)
  const exact = rounding === 'round' ? sub(figure, div(ulp, q(2n))) : figure
  return { figure, exactMs: convertSpeed(exact, record.unit, 'm/s'), needed }
}

/**
 * The longest return time t2 such that the pair still reaches speed vMin: under the mean of times,
 * d / ((t1 + t2) / 2) ≥ vMin ⇔ t2 ≤ 2d / vMin − t1. Floored to the timing resolution; null if none.
 */
export function returnTarget(
  profile: RuleProfile,
  distanceM: Q,
  first: { elapsedS: Q, speedMs: Q },
  vMin: Q,
  decimals: number,
): Q | null {
  let longest: Q
  if (profile.averaging.value === 'mean-of-times') {
    longest = sub(div(mul(q(2n), distanceM), vMin), first.elapsedS)
  }
  else {
    const v2 = sub(mul(q(2n), vMin), first.speedMs)
    if (!isPositive(v2)) return null // any finishing time would do; no useful target
    longest = div(distanceM, v2)
  }
  const floored = floorTo(longest, decimals)
  return isPositive(floored) ? floored : null
}

/** The result as published in the record's unit, as an exact decimal. */
function publishedFigure(profile: RuleProfile, speedMs: Q, unit: StandingRecord['unit']) {
  const { decimals, rounding } = profile.figures.value
  const text = toFixed(convertSpeed(speedMs, 'm/s', unit), decimals, rounding)
  return q(BigInt(text.replace('.', '')), 10n ** BigInt(decimals))
}

function marginRule(profile: RuleProfile, record?: StandingRecord) {
  if (record?.minimum) {
    return {
      name: 'Vacant class',
      value: 'a first record must reach the minimum the organiser set',
      source: 'the organiser\'s minimum for the vacant class',
      certainty: 'common practice' as const,
    }
  }
  const { percent } = profile.margin.value
  const value = percent ? `at least ${percent} % over the standing record` : 'exceed the standing record'
  return ruleOf(profile, 'margin', 'Improvement needed', value)
}

function notBeatenFinding(profile: RuleProfile, fig: Q, record: StandingRecord, requiredText: string): Finding {
  const { decimals } = profile.figures.value
  const { unit } = record
  const achieved = `${toFixed(fig, decimals)} ${unit}`
  const standing = `${toFixed(record.value, decimals)} ${unit}`
  const overOld = cmp(fig, record.value) > 0
  if (record.minimum) {
    return {
      code: 'record.minimum-not-reached',
      severity: 'fail',
      message: `${achieved} does not reach the minimum of ${standing} set for this vacant class.`,
      rule: marginRule(profile, record),
    }
  }
  return {
    code: overOld ? 'record.margin-not-met' : 'record.not-beaten',
    severity: 'fail',
    message: overOld
      ? `${achieved} is over the standing record of ${standing} but not by the margin: `
      + `at least ${requiredText} ${unit} is needed.`
      : `${achieved} does not beat the standing record of ${standing}.`,
    rule: marginRule(profile),
  }
}

interface RecordComparison {
  required: NonNullable<AttemptResult['required']>
  beatsRecord: boolean | null
  returnTargetS: Q | null
  findings: Finding[]
}

/** The figure needed, whether the result reaches it, and the longest return run that still would. */
export function compareWithRecord(
  input: AttemptInput & { record: StandingRecord },
  first: RunFigures,
  result: AttemptResult['result'],
): RecordComparison {
  const { profile, distanceM, record } = input
  const t = thresholdSpeed(profile, record)
  const { unit } = record
  const required = { value: t.figure, text: toFixed(t.figure, profile.figures.value.decimals, 'truncate'), unit }
  const findings: Finding[] = []
  let beatsRecord: boolean | null = null
  if (result) {
    const fig = publishedFigure(profile, result.speedMs, unit)
    beatsRecord = cmp(fig, t.figure) >= 0
    if (!beatsRecord) findings.push(notBeatenFinding(profile, fig, record, required.text))
  }
  const returnTargetS = returnTarget(profile, distanceM, first, t.exactMs, input.timeDecimals ?? 3)
  if (!returnTargetS) {
    findings.push({
      code: 'return.unreachable',
      severity: 'warn',
      message: `No return run can lift the result to ${required.text} ${unit} after a first run at `
        + `${unit === 'mph' ? first.mph : first.kmh} ${unit}.`,
      rule: marginRule(profile, record),
    })
  }
  return { required, beatsRecord, returnTargetS, findings }
}

/**
 * Where the profile has a qualifying run that must itself beat the standing record (club procedure),
 * a failing finding when it does not: no record run may follow it, and the entry qualifies again.
 */
export function qualifierFindings(
  profile: RuleProfile,
  record: StandingRecord | undefined,
  qualifier: RunFigures,
): Finding[] {
  const rule = profile.qualifying?.value
  if (!rule?.mustBeatRecord || !record) return []
  const t = thresholdSpeed(profile, record)
  const fig = publishedFigure(profile, qualifier.speedMs, record.unit)
  if (cmp(fig, t.figure) >= 0) return []
  const { decimals } = profile.figures.value
  return [{
    code: 'qualifier.not-over-record',
    severity: 'fail',
    message: `The qualifying run at ${toFixed(fig, decimals)} ${record.unit} does not beat the standing record of `
      + `${toFixed(record.value, decimals)} ${record.unit} (at least ${toFixed(t.figure, decimals, 'truncate')} `
      + `${record.unit} needed): no record run may follow it; the entry qualifies again.`,
    rule: {
      name: 'Qualifying run',
      value: 'the qualifying run must itself beat the standing record',
      source: profile.qualifying.source,
      certainty: profile.qualifying.certainty,
    },
  }]
}
