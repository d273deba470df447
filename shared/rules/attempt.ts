import { add, ceilTo, cmp, div, floorTo, isPositive, mul, q, sub, toFixed, toNumber, type Q } from './exact'
import type { Finding } from './findings'
import { describeWindow, type RuleProfile, type WindowAnchor } from './profile'
import { speed } from './timing'
import { convertSpeed, type SpeedUnit } from './units'
import { addDays, localDate, localMidnight } from './zoned'

export type Direction = 'out' | 'back'

export interface RunInput {
  direction: Direction
  /** The moment the run started, epoch milliseconds. */
  startedAtMs: number
  /** Time over the measured distance, seconds, exact. */
  elapsedS: Q
}

export interface AttemptInput {
  profile: RuleProfile
  distanceM: Q
  runs: RunInput[]
  record?: { value: Q, unit: Exclude<SpeedUnit, 'm/s'> }
  /** The event's time zone, for rules that count calendar days. */
  timeZone?: string
  /** Decimals of the return-run target time (the timing resolution); 3 unless told. */
  timeDecimals?: number
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
  beatsRecord: boolean | null
  /** Longest return-run time that still gives a figure that counts, at timeDecimals. */
  returnTargetS: Q | null
  findings: Finding[]
}

const ruleOf = (
  profile: RuleProfile,
  key: 'runs' | 'window' | 'averaging' | 'margin',
  name: string,
  value: string,
) => ({
  name,
  value,
  source: profile[key].source,
  certainty: profile[key].certainty,
})

const publish = (profile: RuleProfile, v: Q, unit: SpeedUnit) =>
  toFixed(convertSpeed(v, 'm/s', unit), profile.figures.value.decimals, profile.figures.value.rounding)

function anchorMs(anchor: WindowAnchor, runs: RunInput[]): Q | null {
  const run = anchor.endsWith('first') ? runs[0] : runs[1]
  if (!run) return null
  const start = q(BigInt(run.startedAtMs))
  return anchor.startsWith('start') ? start : add(start, mul(run.elapsedS, q(1000n)))
}

function evaluateWindow(profile: RuleProfile, runs: RunInput[], timeZone: string): WindowState {
  const w = profile.window.value
  const rule = describeWindow(w)
  if (w.kind === 'next-day') {
    const first = runs[0]!
    const day = addDays(localDate(first.startedAtMs, timeZone), 1)
    const opensMs = localMidnight(day, timeZone)
    const deadlineMs = localMidnight(addDays(day, 1), timeZone) - 1
    const second = runs[1]
    const ok = !second || (second.startedAtMs >= opensMs && second.startedAtMs <= deadlineMs)
    return { ok, rule, usedS: null, deadlineMs, opensMs, closingAnchor: 'start-second' }
  }
  const from = anchorMs(w.from, runs)
  const limitMs = q(BigInt(w.minutes * 60_000))
  const to = anchorMs(w.to, runs)
  const deadlineMs = from ? Math.floor(toNumber(add(from, limitMs))) : null
  if (!from || !to) return { ok: true, rule, usedS: null, deadlineMs, opensMs: null, closingAnchor: w.to }
  const used = sub(to, from)
  return {
    ok: cmp(used, limitMs) <= 0,
    rule,
    usedS: div(used, q(1000n)),
    deadlineMs,
    opensMs: null,
    closingAnchor: w.to,
  }
}

/** The smallest exact speed (m/s) whose published figure counts against the record. */
function thresholdSpeed(profile: RuleProfile, record: NonNullable<AttemptInput['record']>) {
  const { decimals, rounding } = profile.figures.value
  const { percent, inclusive } = profile.margin.value
  const needed = mul(record.value, add(q(1n), div(q(BigInt(Math.round(percent * 1e6))), q(100_000_000n))))
  const ulp = q(1n, 10n ** BigInt(decimals))
  const figure = inclusive ? ceilTo(needed, decimals) : add(floorTo(needed, decimals), ulp)
  const exact = rounding === 'round' ? sub(figure, div(ulp, q(2n))) : figure
  return { figure, exactMs: convertSpeed(exact, record.unit, 'm/s'), needed }
}

export function evaluateAttempt(input: AttemptInput): AttemptResult {
  const { profile, distanceM } = input
  const timeZone = input.timeZone ?? 'UTC'
  const findings: Finding[] = []
  const runs = [...input.runs].sort((a, b) => a.startedAtMs - b.startedAtMs)
  if (runs.length === 0) throw new RangeError('an attempt needs at least one run')

  const figures: RunFigures[] = runs.map((r) => {
    const v = speed(distanceM, r.elapsedS)
    return {
      direction: r.direction,
      startedAtMs: r.startedAtMs,
      elapsedS: r.elapsedS,
      speedMs: v,
      kmh: publish(profile, v, 'km/h'),
      mph: publish(profile, v, 'mph'),
    }
  })

  const wanted = profile.runs.value.directions
  const [first, second] = runs
  if (!second) {
    findings.push({
      code: 'pair.awaiting-return',
      severity: 'info',
      message:
        wanted === 'opposite'
          ? 'One run so far: the return run in the opposite direction completes the pair.'
          : 'One run so far: the record run in the same direction completes the pair.',
      rule: ruleOf(profile, 'runs', 'Runs', `2, ${wanted} directions`),
    })
  }
  else {
    const same = first!.direction === second.direction
    if ((wanted === 'opposite') === same) {
      findings.push({
        code: 'pair.direction',
        severity: 'fail',
        message:
          wanted === 'opposite'
            ? 'Both runs went the same way; the profile needs one run in each direction.'
            : 'The runs went in opposite directions; the profile needs both in the same direction.',
        rule: ruleOf(profile, 'runs', 'Runs', `2, ${wanted} directions`),
      })
    }
    const firstFinish = first!.startedAtMs + toNumber(first!.elapsedS) * 1000
    if (second.startedAtMs < firstFinish) {
      findings.push({
        code: 'pair.overlap',
        severity: 'fail',
        message: 'The second run starts before the first one finished: check the start times.',
      })
    }
  }

  const window = evaluateWindow(profile, runs, timeZone)
  if (!window.ok) {
    findings.push({
      code: 'window.exceeded',
      severity: 'fail',
      message:
        profile.window.value.kind === 'next-day'
          ? 'The record run is not on the calendar day after the qualifying run.'
          : `The runs took ${toFixed(div(window.usedS!, q(60n)), 1, 'truncate')} min between the anchors; the window is ${window.rule}.`,
      rule: ruleOf(profile, 'window', 'Time window', window.rule),
    })
  }

  let meanTimeS: Q | null = null
  let result: AttemptResult['result'] = null
  if (second) {
    meanTimeS = div(add(first!.elapsedS, second.elapsedS), q(2n))
    const v
      = profile.averaging.value === 'mean-of-times'
        ? speed(distanceM, meanTimeS)
        : div(add(figures[0]!.speedMs, figures[1]!.speedMs), q(2n))
    result = { speedMs: v, kmh: publish(profile, v, 'km/h'), mph: publish(profile, v, 'mph') }
    if (profile.averaging.certainty === 'not settled') {
      findings.push({
        code: 'averaging.not-settled',
        severity: 'info',
        message: `The result is the ${profile.averaging.value === 'mean-of-times' ? 'distance over the mean of the two times' : 'mean of the two speeds'}; the rulebook in force decides which average applies.`,
        rule: ruleOf(profile, 'averaging', 'Result', profile.averaging.value),
      })
    }
  }

  let required: AttemptResult['required'] = null
  let beatsRecord: boolean | null = null
  let returnTargetS: Q | null = null
  if (input.record) {
    const { decimals, rounding } = profile.figures.value
    const t = thresholdSpeed(profile, input.record)
    const unit = input.record.unit
    required = { value: t.figure, text: toFixed(t.figure, decimals, 'truncate'), unit }
    const marginRule = ruleOf(
      profile,
      'margin',
      'Improvement needed',
      profile.margin.value.percent
        ? `at least ${profile.margin.value.percent} % over the standing record`
        : 'exceed the standing record',
    )
    if (result) {
      const fig = q(
        BigInt(toFixed(convertSpeed(result.speedMs, 'm/s', unit), decimals, rounding).replace('.', '')),
        10n ** BigInt(decimals),
      )
      beatsRecord = cmp(fig, t.figure) >= 0
      if (!beatsRecord) {
        const overOld = cmp(fig, input.record.value) > 0
        findings.push({
          code: overOld ? 'record.margin-not-met' : 'record.not-beaten',
          severity: 'fail',
          message: overOld
            ? `${toFixed(fig, decimals)} ${unit} is over the standing record of ${toFixed(input.record.value, decimals)} ${unit} but not by the margin: at least ${required.text} ${unit} is needed.`
            : `${toFixed(fig, decimals)} ${unit} does not beat the standing record of ${toFixed(input.record.value, decimals)} ${unit}.`,
          rule: marginRule,
        })
      }
    }
    returnTargetS = returnTarget(profile, distanceM, figures[0]!, t.exactMs, input.timeDecimals ?? 3)
    if (!returnTargetS) {
      findings.push({
        code: 'return.unreachable',
        severity: 'warn',
        message: `No return run can lift the result to ${required.text} ${unit} after a first run at ${unit === 'mph' ? figures[0]!.mph : figures[0]!.kmh} ${unit}.`,
        rule: marginRule,
      })
    }
  }
  return { runs: figures, meanTimeS, result, window, required, beatsRecord, returnTargetS, findings }
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

/** Seconds left until a deadline at a given moment (negative once it has passed). */
export const secondsLeft = (deadlineMs: number, nowMs: number) => Math.floor((deadlineMs - nowMs) / 1000)
