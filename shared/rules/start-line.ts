// What the start line checks before a run leaves: the rider's licence, its grade for the expected speed,
// the medical, the riders' briefing, and what the speed already reached says. Pure: the server passes what it loaded.
import { countNeeded } from '../inspection/evaluate'
import { cmp, fromInput } from './exact'

/** A licence grade of a graded (club) scheme: the fastest speed it allows, null for no limit. */
export interface LicenceGrade {
  label: string
  maxKmh: number | null
}

/** How a profile licenses riders: graded by speed (earned step by step) or not, and whether a medical is needed. */
export interface LicenceRule {
  grades: LicenceGrade[] | null
  medical: boolean
}

export const START_LINE_CODES = ['licence.expired', 'licence.grade', 'licence.no-grade', 'licence.speed-unknown',
  'licence.upgrade-too-far', 'licence.medical', 'briefing.none', 'briefing.missed', 'reached.licence-grade',
  'reached.tyre-rating', 'reached.parachutes'] as const
export type StartLineCode = (typeof START_LINE_CODES)[number]

export interface StartLineFinding {
  code: StartLineCode
  message: string
}

export interface StartLineInput {
  licence: LicenceRule | null
  briefingRequired: boolean
  rider: {
    name: string
    licenceNo: string
    licenceExpires: string
    licenceGrade: string | null
    medicalExpires: string | null
  }
  /** The run's day in the event's zone, YYYY-MM-DD. */
  day: string
  /** The speed the run expects, km/h: said at the start, else the machine's declared speed at inspection. */
  expectedKmh: number | null
  /** A licence upgrade run into the next grade, where the profile grades licences. */
  upgrade: boolean
  /** The latest briefing held before the start, and whether this rider signed on to it. */
  briefing: { title: string, heldAtLocal: string, signedOn: boolean } | null
}

export const gradeIndex = (grades: LicenceGrade[], label: string | null) =>
  label === null ? -1 : grades.findIndex(g => g.label.toLowerCase() === label.trim().toLowerCase())

const limit = (g: LicenceGrade) => (g.maxKmh === null ? 'no limit' : `up to ${g.maxKmh} km/h`)

/**
 * What blocks this start: each finding names what is wrong and with which record. Only the clerk of the
 * course can let a run start over them, with a signed reason.
 */
export function startLineFindings(x: StartLineInput): StartLineFinding[] {
  const out: StartLineFinding[] = []
  const r = x.rider
  if (r.licenceExpires < x.day) {
    out.push({ code: 'licence.expired', message: `${r.name}'s licence ${r.licenceNo} expired on ${r.licenceExpires}` })
  }
  if (x.licence?.medical && (!r.medicalExpires || r.medicalExpires < x.day)) {
    out.push({
      code: 'licence.medical',
      message: r.medicalExpires
        ? `${r.name}'s medical expired on ${r.medicalExpires}`
        : `no medical recorded for ${r.name}; the profile requires one`,
    })
  }
  const grades = x.licence?.grades
  if (grades?.length) out.push(...gradeFindings(grades, x))
  if (x.briefingRequired && !x.briefing) {
    out.push({
      code: 'briefing.none',
      message: 'no riders\' briefing has been held before this start; the profile requires one before any run',
    })
  }
  if (x.briefingRequired && x.briefing && !x.briefing.signedOn) {
    out.push({
      code: 'briefing.missed',
      message: `${r.name} did not sign on to the ${x.briefing.title} (${x.briefing.heldAtLocal})`,
    })
  }
  return out
}

function gradeFindings(grades: LicenceGrade[], x: StartLineInput): StartLineFinding[] {
  const at = gradeIndex(grades, x.rider.licenceGrade)
  if (at < 0) {
    return [{
      code: 'licence.no-grade',
      message: x.rider.licenceGrade
        ? `licence grade “${x.rider.licenceGrade}” is not a grade of this profile `
        + `(${grades.map(g => g.label).join(', ')})`
        : `no licence grade recorded for ${x.rider.name}`,
    }]
  }
  if (x.expectedKmh === null) {
    return [{
      code: 'licence.speed-unknown',
      message: 'no expected speed: say it at the start, or declare it at inspection',
    }]
  }
  const grade = grades[at]!
  const within = (g: LicenceGrade) => g.maxKmh === null || x.expectedKmh! <= g.maxKmh
  if (within(grade)) return []
  const next = grades[at + 1]
  if (x.upgrade) {
    if (next && within(next)) return []
    return [{
      code: 'licence.upgrade-too-far',
      message: `an upgrade run goes one grade up: ${next ? `${next.label} (${limit(next)})` : 'none above'}, `
        + `not ${x.expectedKmh} km/h`,
    }]
  }
  return [{
    code: 'licence.grade',
    message: `grade ${grade.label} allows ${limit(grade)}; this run expects ${x.expectedKmh} km/h`
      + (next && within(next) ? ` (a licence upgrade run to ${next.label} may be declared)` : ''),
  }]
}

/** The grade an upgrade run would earn: the next one up from the rider's, or null. */
export function upgradeTarget(grades: LicenceGrade[] | null | undefined, label: string | null) {
  if (!grades?.length) return null
  const at = gradeIndex(grades, label)
  return at >= 0 ? grades[at + 1] ?? null : null
}

/** The fastest the machine went at the event so far, and what it was inspected and licensed for. */
export interface ReachedInput {
  /**
   * Its best official speed so far (time over a measured distance, km/h), the run, and whether that run was a
   * licence upgrade run (its purpose was to go over the grade); null before its first timed run.
   */
  reached: { kmh: string, runId: number, upgrade: boolean } | null
  /** The rider's grade and its ceiling, where the profile grades licences. */
  grade: LicenceGrade | null
  /** The tyres' rated speed recorded at the inspection in force, km/h; null where not recorded. */
  tyreRatedKmh: number | null
  /** Parachutes fitted at the inspection in force (null: none asked, not applicable), and the steps by speed. */
  parachutes: { fitted: number, steps: { overMph: number, count: number }[] } | null
}

export function reachedFindings(x: ReachedInput): StartLineFinding[] {
  if (!x.reached) return []
  const v = fromInput(x.reached.kmh)
  const over = (limit: number) => cmp(v, fromInput(limit)) > 0
  const out: StartLineFinding[] = []
  const reached = `run #${x.reached.runId} reached ${x.reached.kmh} km/h`
  if (x.grade && x.grade.maxKmh !== null && over(x.grade.maxKmh) && !x.reached.upgrade) {
    out.push({ code: 'reached.licence-grade',
      message: `${reached}, over the ${x.grade.maxKmh} km/h of licence grade ${x.grade.label}` })
  }
  if (x.tyreRatedKmh !== null && over(x.tyreRatedKmh)) {
    out.push({ code: 'reached.tyre-rating', message: `${reached}, over its tyres' rated ${x.tyreRatedKmh} km/h` })
  }
  if (x.parachutes) {
    // Over 175 mph one, over 300 mph two (club rules, from memory): the checklist's own steps, exact in km/h.
    const needed = countNeeded(x.parachutes.steps, v)
    if (needed > x.parachutes.fitted) {
      out.push({ code: 'reached.parachutes', message: `${reached}, at which ${needed} parachute(s) are needed; `
        + `${x.parachutes.fitted} fitted at inspection` })
    }
  }
  return out
}
