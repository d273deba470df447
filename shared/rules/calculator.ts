import type { CalculatorRequestInput, CalculatorResponse } from '../schemas/calculator'
import { evaluateAttempt } from './attempt'
import { add, cmp, decimalsOf, fromInput, mul, q, roundTo, toFixed, toNumber, type Q } from './exact'
import { profiles } from './profiles'

/** The public calculator: one request in, every figure as a decimal string out. Same code on page and server. */
export function calculate(req: CalculatorRequestInput): CalculatorResponse {
  const profile = profiles[req.profile]
  const timeDecimals = Math.max(3, ...req.runs.map(r => decimalsOf(r.elapsedS)))
  const record
    = req.recordKmh !== undefined
      ? { value: fromInput(req.recordKmh), unit: 'km/h' as const }
      : req.recordMph !== undefined
        ? { value: fromInput(req.recordMph), unit: 'mph' as const }
        : undefined
  const r = evaluateAttempt({
    profile,
    distanceM: fromInput(req.distanceM),
    runs: req.runs.map(run => ({
      direction: run.direction,
      startedAtMs: Date.parse(run.startedAt),
      elapsedS: fromInput(run.elapsedS),
      // Crossing the entry trap plus the time over the distance: the instant the run left it.
      finishedAtMs: run.entryAt === undefined
        ? undefined
        : toNumber(add(q(BigInt(Date.parse(run.entryAt))), mul(fromInput(run.elapsedS), q(1000n)))),
    })),
    record,
    timeZone: req.timeZone,
    timeDecimals,
  })
  const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString())
  return {
    profile: {
      id: profile.id,
      version: profile.version,
      name: profile.name,
      decimals: profile.figures.value.decimals,
    },
    runs: r.runs.map(x => ({
      direction: x.direction,
      elapsedS: toFixed(x.elapsedS, timeDecimals),
      speedKmh: x.kmh,
      speedMph: x.mph,
    })),
    meanTimeS: r.meanTimeS ? exactTime(r.meanTimeS, timeDecimals) : null,
    resultKmh: r.result?.kmh ?? null,
    resultMph: r.result?.mph ?? null,
    windowOk: r.window.ok,
    window: {
      rule: r.window.rule,
      usedS: r.window.usedS ? toFixed(r.window.usedS, 3) : null,
      deadline: iso(r.window.deadlineMs),
      opens: iso(r.window.opensMs),
    },
    valid: r.valid,
    beatsRecord: r.beatsRecord,
    required: r.required ? { figure: r.required.text, unit: r.required.unit } : null,
    returnTargetS: r.returnTargetS ? toFixed(r.returnTargetS, timeDecimals) : null,
    findings: r.findings,
  }
}

/** A mean of two times needs at most one decimal more than the times; show it only when needed. */
const exactTime = (t: Q, decimals: number) =>
  toFixed(t, cmp(roundTo(t, decimals, 'truncate'), t) === 0 ? decimals : decimals + 1, 'truncate')
