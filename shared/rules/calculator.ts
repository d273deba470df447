import type { CalculatorRequestInput, CalculatorResponse } from '../schemas/calculator'
import { evaluateAttempt } from './attempt'
import { add, cmp, decimalsOf, fromDecimal, fromInput, mul, q, roundTo, toFixed, toNumber, type Q } from './exact'
import type { Finding } from './findings'
import type { RuleProfile } from './profile'
import { profiles } from './profiles'

/**
 * What the calculator cannot decide from what it was given, in words: the window when a run's finish is only
 * estimated (no entry instant), and any verdict for a distance the profile does not list. The figures are computed
 * all the same; the verdict is not given.
 */
export function cannotDecide(profile: RuleProfile, distanceM: Q, findings: Finding[]): string[] {
  const reasons: string[] = []
  if (findings.some(f => f.code === 'window.estimated')) {
    reasons.push('the time window: without the instant each run entered the measured distance, its finish is only '
      + 'estimated (give each run\'s entry instant)')
  }
  if (!profile.distances.value.some(d => cmp(fromDecimal(d.metres), distanceM) === 0)) {
    const listed = profile.distances.value.map(d => `${d.label} (${d.metres} m)`).join(', ')
    reasons.push(`whether it counts: ${toFixed(distanceM, 3)} m is not a distance of the profile, which lists `
      + `${listed}`)
  }
  return reasons
}

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
  const undecided = cannotDecide(profile, fromInput(req.distanceM), r.findings)
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
    // Valid only when everything it turns on could be decided; else the reasons. Beating the record is arithmetic
    // on the figures, given as such.
    valid: r.valid && !undecided.length,
    cannotDecide: undecided,
    beatsRecord: r.beatsRecord,
    required: r.required ? { figure: r.required.text, unit: r.required.unit } : null,
    returnTargetS: r.returnTargetS ? toFixed(r.returnTargetS, timeDecimals) : null,
    findings: r.findings,
  }
}

/** A mean of two times needs at most one decimal more than the times; show it only when needed. */
const exactTime = (t: Q, decimals: number) =>
  toFixed(t, cmp(roundTo(t, decimals, 'truncate'), t) === 0 ? decimals : decimals + 1, 'truncate')
