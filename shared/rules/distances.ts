import { cmp, fromDecimal, ZERO } from './exact'
import type { MeasuredDistanceSpec, RuleProfile } from './profile'
import type { StartKind } from '../constants'

/** A measured distance of a course as an entry claims it. */
export interface ClaimedDistance {
  id: number
  label: string
  start: StartKind
  nominalM: string
  courseId: number
  /** The surveyed position of its entry trap, metres from the course's start line. */
  entryTrapPositionM: string
}

/**
 * The profile's distance that a measured distance of the course is: the same start and the same nominal
 * length, exactly (a flying kilometre of the course is the profile's flying 1000 m, whatever its label).
 */
export function profileDistanceOf(
  profile: RuleProfile,
  d: { start: StartKind, nominalM: string },
): MeasuredDistanceSpec | undefined {
  return profile.distances.value.find(
    p => p.start === d.start && cmp(fromDecimal(p.metres), fromDecimal(d.nominalM)) === 0,
  )
}

/**
 * Whether a run counts for a distance: a standing-start distance is timed from rest at the start line, so
 * only a standing start yields it, never a flying pass; a flying distance is entered at speed, so only a
 * flying pass yields it (common practice: "a flying pass never yields a standing figure"; the converse is
 * our reading, common practice: standing and flying records are separate attempts).
 */
export const runCountsFor = (distanceStart: StartKind, runStart: StartKind) => distanceStart === runStart

/** The start kind a run of an entry takes when none is given: standing only for standing claims alone. */
export const defaultRunStart = (claims: { start: StartKind }[]): StartKind =>
  claims.length && claims.every(c => c.start === 'standing') ? 'standing' : 'flying'

export interface ClaimProblem {
  path: 'distanceIds'
  message: string
}

/**
 * What is wrong with an entry's claimed distances: each must be one the profile lists (by start and
 * length), all on one course (one pass yields them all), none twice; a standing-start distance starts at
 * the start line, so its entry trap must stand there (position 0 m).
 */
export function claimProblems(profile: RuleProfile, claims: ClaimedDistance[]): ClaimProblem[] {
  const problems: string[] = []
  if (!claims.length) problems.push('claim at least one measured distance')
  if (new Set(claims.map(c => c.id)).size !== claims.length) problems.push('a distance is claimed twice')
  if (new Set(claims.map(c => c.courseId)).size > 1) {
    problems.push('the distances are on different courses; one pass yields only the distances of its course')
  }
  const listed = profile.distances.value.map(p => `${p.label} (${p.start}, ${p.metres} m)`).join('; ')
  for (const c of claims) {
    if (!profileDistanceOf(profile, c)) {
      problems.push(`${c.label} (${c.start}, ${c.nominalM} m) is not a distance of the profile, which lists: ${listed}`)
    }
    if (c.start === 'standing' && cmp(fromDecimal(c.entryTrapPositionM), ZERO) !== 0) {
      problems.push(`${c.label} is a standing start: its entry trap must be the start line (0 m), `
        + `not ${c.entryTrapPositionM} m`)
    }
  }
  return problems.map(message => ({ path: 'distanceIds', message }))
}
