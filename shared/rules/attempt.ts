import { add, div, q, toNumber, type Q } from './exact'
import type { Finding } from './findings'
import type { RuleProfile } from './profile'
import { speed } from './timing'
import { compareWithRecord, qualifierFindings } from './attempt-record'
import {
  publish,
  ruleOf,
  type AttemptInput,
  type AttemptResult,
  type RunFigures,
  type RunInput,
} from './attempt-types'
import { evaluateWindow, finishMs, windowFindings } from './attempt-window'
import { impoundFindings } from './attempt-impound'
import { leaveBy } from './leave-by'

export type * from './attempt-types'
export { returnTarget } from './attempt-record'

/**
 * Everything the rule profile says about an attempt's runs: each run's speed, the pair's result,
 * the time window, the figure needed against the standing record and the return-run target.
 */
export function evaluateAttempt(input: AttemptInput): AttemptResult {
  const { profile } = input
  const runs = [...input.runs].sort((a, b) => a.startedAtMs - b.startedAtMs)
  if (runs.length === 0) throw new RangeError('an attempt needs at least one run')
  const figures = runs.map(r => runFigures(profile, input.distanceM, r))
  const window = evaluateWindow(profile, runs, input.timeZone ?? 'UTC')
  const pair = pairResult(profile, input.distanceM, figures)
  const record = input.record ? compareWithRecord({ ...input, record: input.record }, figures[0]!, pair.result) : null
  const qualifierFinishMs = Math.round(toNumber(finishMs(runs[0]!)))
  const zone = input.timeZone ?? 'UTC'
  const impound = impoundFindings(profile, qualifierFinishMs, input.impoundCheckInMs, runs.length > 1, zone)
  const profileFindings = [
    ...pairFindings(profile, runs),
    ...windowFindings(profile, window, runs),
    ...qualifierFindings(profile, input.record, figures[0]!),
    ...impound.findings,
    ...pair.findings,
  ]
  // A pair that fails its profile is not a record, whatever its speed; not beating the record is no such failure.
  const valid = !profileFindings.some(f => f.severity === 'fail')
  const findings = [...profileFindings, ...(record?.findings ?? [])]
  return {
    runs: figures,
    meanTimeS: pair.meanTimeS,
    result: pair.result,
    window,
    required: record?.required ?? null,
    valid,
    beatsRecord: record?.beatsRecord == null ? null : record.beatsRecord && valid,
    meetsImprovement: record?.beatsRecord ?? null,
    returnTargetS: record?.returnTargetS ?? null,
    leaveBy: runs.length === 1
      ? leaveBy(window, runs[0]!, record?.returnTargetS ?? null, input.timeDecimals ?? 3)
      : null,
    impoundDeadlineMs: impound.deadlineMs,
    findings,
  }
}

function runFigures(profile: RuleProfile, distanceM: Q, r: RunInput): RunFigures {
  const v = speed(distanceM, r.elapsedS)
  return {
    direction: r.direction,
    startedAtMs: r.startedAtMs,
    elapsedS: r.elapsedS,
    speedMs: v,
    kmh: publish(profile, v, 'km/h'),
    mph: publish(profile, v, 'mph'),
  }
}

/** Whether the runs make a pair by the profile: both present, in the right directions, one after the other. */
function pairFindings(profile: RuleProfile, runs: RunInput[]): Finding[] {
  const wanted = profile.runs.value.directions
  const rule = ruleOf(profile, 'runs', 'Runs', `2, ${wanted} directions`)
  const [first, second] = runs as [RunInput, RunInput | undefined]
  if (!second) {
    const message = wanted === 'opposite'
      ? 'One run so far: the return run in the opposite direction completes the pair.'
      : 'One run so far: the record run in the same direction completes the pair.'
    return [{ code: 'pair.awaiting-return', severity: 'info', message, rule }]
  }
  const findings: Finding[] = []
  if ((wanted === 'opposite') === (first.direction === second.direction)) {
    const message = wanted === 'opposite'
      ? 'Both runs went the same way; the profile needs one run in each direction.'
      : 'The runs went in opposite directions; the profile needs both in the same direction.'
    findings.push({ code: 'pair.direction', severity: 'fail', message, rule })
  }
  if (second.startedAtMs < toNumber(finishMs(first))) {
    findings.push({
      code: 'pair.overlap',
      severity: 'fail',
      message: 'The second run starts before the first one finished: check the start times.',
    })
  }
  return findings
}

/** The pair's result by the profile's averaging: the distance over the mean time, or the mean of the speeds. */
function pairResult(profile: RuleProfile, distanceM: Q, figures: RunFigures[]) {
  const [first, second] = figures
  if (!first || !second) return { meanTimeS: null, result: null, findings: [] }
  const meanTimeS = div(add(first.elapsedS, second.elapsedS), q(2n))
  const meanOfTimes = profile.averaging.value === 'mean-of-times'
  const v = meanOfTimes ? speed(distanceM, meanTimeS) : div(add(first.speedMs, second.speedMs), q(2n))
  const result = { speedMs: v, kmh: publish(profile, v, 'km/h'), mph: publish(profile, v, 'mph') }
  const findings: Finding[] = []
  if (profile.averaging.certainty === 'not settled') {
    const average = meanOfTimes ? 'distance over the mean of the two times' : 'mean of the two speeds'
    findings.push({
      code: 'averaging.not-settled',
      severity: 'info',
      message: `The result is the ${average}; the rulebook in force decides which average applies.`,
      rule: ruleOf(profile, 'averaging', 'Result', profile.averaging.value),
    })
  }
  return { meanTimeS, result, findings }
}
