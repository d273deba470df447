import { abs, cmp, div, fromInput, mul, q, sub, toFixed, type Q } from './exact'
import type { Finding } from './findings'
import type { MassClass, RuleProfile } from './profile'

const rad = (deg: number) => (deg * Math.PI) / 180

export interface WindComponents {
  /** Positive: head-wind; negative: tail-wind. m/s. */
  headMs: number
  /** Positive: from the right of the direction of travel. m/s. */
  crossMs: number
}

/**
 * Wind blowing FROM bearing fromDeg at speedMs, machine heading headingDeg (direction of travel):
 * θ = from − heading, head-wind = W·cos θ, cross-wind = W·sin θ. The return run has heading + 180°.
 */
export function windComponents(speedMs: number, fromDeg: number, headingDeg: number): WindComponents {
  const theta = rad(fromDeg - headingDeg)
  const clean = (x: number) => (Math.abs(x) < 1e-12 ? 0 : x)
  return { headMs: clean(speedMs * Math.cos(theta)), crossMs: clean(speedMs * Math.sin(theta)) }
}

export function checkWind(profile: RuleProfile, wind: WindComponents): Finding[] {
  const limit = profile.tailWindLimitMs.value
  const tail = -wind.headMs
  if (limit === null || tail <= limit) return []
  return [
    {
      code: 'wind.tail-over-limit',
      severity: 'fail',
      message: `Tail-wind component ${tail.toFixed(2)} m/s is over the profile's limit of ${limit} m/s.`,
      rule: {
        name: 'Tail-wind limit',
        value: `${limit} m/s`,
        source: profile.tailWindLimitMs.source,
        certainty: profile.tailWindLimitMs.certainty,
      },
    },
  ]
}

/** Gradient in percent from surveyed elevations at both ends and the horizontal distance between them. */
export function gradientPercent(elevationStartM: Q, elevationEndM: Q, horizontalM: Q): Q {
  if (cmp(horizontalM, q(0n)) <= 0) throw new RangeError('horizontal distance must be positive')
  return mul(div(sub(elevationEndM, elevationStartM), horizontalM), q(100n))
}

export function checkGradient(profile: RuleProfile, percent: Q): Finding[] {
  const limit = profile.gradientMaxPercent.value
  if (limit === null || cmp(abs(percent), fromInput(limit)) <= 0) return []
  return [
    {
      code: 'course.gradient-over-limit',
      severity: 'fail',
      message: `The measured distance has a gradient of ${toFixed(abs(percent), 3, 'round')} %, over the limit of `
        + `${limit} %.`,
      rule: {
        name: 'Course gradient',
        value: `at most ${limit} %`,
        source: profile.gradientMaxPercent.source,
        certainty: profile.gradientMaxPercent.certainty,
      },
    },
  ]
}

/** Primary and backup timing systems should agree on a segment within the equipment's tolerance. */
export function crossCheck(
  primaryS: Q,
  backupS: Q,
  toleranceS: Q,
): { differenceS: Q, ok: boolean, findings: Finding[] } {
  const differenceS = abs(sub(primaryS, backupS))
  const ok = cmp(differenceS, toleranceS) <= 0
  return {
    differenceS,
    ok,
    findings: ok
      ? []
      : [
          {
            code: 'timing.cross-check',
            severity: 'fail',
            message: `Primary and backup timing differ by ${toFixed(differenceS, 6, 'round')} s, more than the `
              + `tolerance of ${toFixed(toleranceS, 6, 'round')} s. The timekeeper must resolve it in writing.`,
          },
        ],
  }
}

/** The mass class a measured mass falls in, where a profile defines classes (smallest first). */
export function massClass(classes: MassClass[] | null, massKg: number): MassClass | null {
  if (!classes?.length || !(massKg > 0)) return null
  const sorted = [...classes].sort((a, b) => (a.maxKg ?? Infinity) - (b.maxKg ?? Infinity))
  return sorted.find(c => c.maxKg === null || massKg <= c.maxKg) ?? null
}
