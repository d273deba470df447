import { abs, cmp, fromDecimal, mul, q, sub, toFixed } from './exact'
import type { Finding } from './findings'
import { checkGradient, gradientPercent } from './checks'
import type { RuleProfile } from './profile'

export interface DistanceCheck {
  surveyedM: string
  differenceMm: string
  withinTolerance: boolean
  gradientPercent: string
  findings: Finding[]
}

/**
 * A measured distance against the surveyed trap positions. Shorter than nominal is never accepted,
 * since timing a shorter distance as the nominal one inflates the speed (common practice, reasoned);
 * longer is accepted within the survey tolerance. The gradient must be within the profile's limit.
 */
export function checkMeasuredDistance(
  profile: RuleProfile,
  entry: { positionM: string, elevationM: string },
  exit: { positionM: string, elevationM: string },
  nominalM: string,
  toleranceMm: number,
): DistanceCheck {
  const surveyed = abs(sub(fromDecimal(exit.positionM), fromDecimal(entry.positionM)))
  const signedMm = mul(sub(surveyed, fromDecimal(nominalM)), q(1000n))
  const difference = abs(signedMm)
  const shorter = cmp(signedMm, q(0n)) < 0
  const withinTolerance = !shorter && cmp(difference, q(BigInt(toleranceMm))) <= 0
  const findings: Finding[] = []
  if (!withinTolerance) {
    findings.push({
      code: 'course.distance-off-survey',
      severity: 'fail',
      message: `The traps are ${toFixed(surveyed, 3)} m apart, ${toFixed(difference, 1, 'round')} mm `
        + `${shorter ? 'shorter than' : 'longer than'} the nominal ${nominalM} m; `
        + (shorter
          ? 'a distance shorter than nominal is never accepted, as it inflates the speed.'
          : `the survey tolerance is ${toleranceMm} mm.`),
    })
  }
  const gradient
    = cmp(surveyed, q(0n)) > 0
      ? gradientPercent(fromDecimal(entry.elevationM), fromDecimal(exit.elevationM), surveyed)
      : q(0n)
  findings.push(...checkGradient(profile, gradient))
  return {
    surveyedM: toFixed(surveyed, 3),
    differenceMm: toFixed(difference, 0, 'round'),
    withinTolerance,
    gradientPercent: toFixed(gradient, 4, 'round'),
    findings,
  }
}
