// Protest and appeal deadlines and states. Pure: instants in, instants and words out, in the event's zone.
import { addDays, localDate, localDateTime, localToInstant } from './zoned'

/**
 * How long after publication a protest (or an appeal, after the decision) may be lodged: a number of minutes,
 * or until a clock time in the event's zone on the day of publication (or a day after).
 */
export type Deadline
  = | { kind: 'minutes', minutes: number }
    | { kind: 'clock', at: string, daysAfter: number }

export interface ProtestRule {
  /** From the publication of what is protested (the signed timing sheet, the signed inspection). */
  lodge: Deadline
  /** The fee the rulebook sets: noted with the protest, not collected by Trapline. */
  fee: string | null
  /** The path and deadline of an appeal against the stewards' decision, or null where there is none. */
  appeal: { deadline: Deadline, to: string } | null
}

export const PROTEST_KINDS = ['result', 'timing', 'inspection', 'entry'] as const
export type ProtestKind = (typeof PROTEST_KINDS)[number]
export const PROTEST_KIND_LABELS: Record<ProtestKind, string> = {
  result: 'Against a result',
  timing: 'Against a timing decision',
  inspection: 'Against an inspection decision',
  entry: 'Against another entry',
}

export const PROTEST_OUTCOMES = ['upheld', 'dismissed'] as const
export type ProtestOutcome = (typeof PROTEST_OUTCOMES)[number]

/** What an upheld decision makes void: nothing (it corrects in the team's favour), the attempt's result, or one run. */
export const PROTEST_VOIDS = ['nothing', 'result', 'run'] as const
export type ProtestVoids = (typeof PROTEST_VOIDS)[number]
export const PROTEST_VOIDS_LABELS: Record<ProtestVoids, string> = {
  nothing: 'Nothing is void (the decision corrects in the team\'s favour)',
  result: 'The attempt\'s result is void',
  run: 'One run is void',
}

/** A decided protest or appeal, as far as its consequence goes. */
export interface DecidedProtest extends ProtestLike {
  outcome: ProtestOutcome | null
  voids: ProtestVoids | null
  voidRunId: number | null
}

/** What stands void on an attempt, and by whose decision: the protest's, or the appeal's that changed it. */
export interface Consequence {
  protestId: number
  decidedBy: number
  voids: 'result' | 'run'
  runId: number | null
}

/**
 * The consequences standing on an attempt. Each protest's consequence is that of the decision that stands: the
 * appeal's once it is decided and upheld (the appeal body decided otherwise, and says what is void), else the
 * protest's own when it was upheld. A dismissed decision, or an upheld one that voids nothing, leaves nothing void;
 * one not yet decided, nothing yet (the open protest blocks the claim on its own).
 */
export function consequencesOn<T extends DecidedProtest>(list: T[], attemptId: number): Consequence[] {
  const out: Consequence[] = []
  for (const p of list.filter(x => x.attemptId === attemptId && x.appealOf === null && x.decidedAt)) {
    const appeal = list.find(a => a.appealOf === p.id && a.decidedAt)
    const standing = appeal?.outcome === 'upheld' ? appeal : p.outcome === 'upheld' ? p : null
    if (!standing || !standing.voids || standing.voids === 'nothing') continue
    out.push({ protestId: p.id, decidedBy: standing.id, voids: standing.voids, runId: standing.voidRunId })
  }
  return out
}

/** The instant a deadline falls, counted from the instant of publication in the event's zone. */
export function deadlineAfter(publishedMs: number, rule: Deadline, timeZone: string): number {
  if (rule.kind === 'minutes') return publishedMs + rule.minutes * 60_000
  const day = addDays(localDate(publishedMs, timeZone), rule.daysAfter)
  return localToInstant(`${day}T${rule.at}`, timeZone)
}

/** A deadline as the event's clock shows it: "00:20 on 2026-12-05 (Europe/Paris)". */
export function clockTime(ms: number, timeZone: string): string {
  const [day, time] = localDateTime(ms, timeZone).split(' ') as [string, string]
  return `${time.slice(0, 5)} on ${day} (${timeZone})`
}

export function describeDeadline(rule: Deadline): string {
  if (rule.kind === 'minutes') return `within ${rule.minutes} min`
  const day = rule.daysAfter === 0
    ? 'the same day'
    : rule.daysAfter === 1 ? 'the next day' : `${rule.daysAfter} days later`
  return `by ${rule.at} ${day}, event's clock`
}

export function describeProtestRule(r: ProtestRule): string {
  return [
    `protest ${describeDeadline(r.lodge)} of publication`,
    r.fee ? `fee: ${r.fee}` : 'no fee',
    r.appeal ? `appeal to ${r.appeal.to}, ${describeDeadline(r.appeal.deadline)} of the decision` : 'no appeal',
  ].join('; ')
}

/** A protest or appeal, as far as its state goes. */
export interface ProtestLike {
  id: number
  attemptId: number
  appealOf: number | null
  decidedAt: string | null
}

/**
 * The protests and appeals still open on each attempt: lodged and not yet decided. While one is, the
 * attempt's dossier is not issued and its claim is not ratified.
 */
export function openProtests<T extends ProtestLike>(list: T[], attemptId: number): T[] {
  return list.filter(p => p.attemptId === attemptId && !p.decidedAt)
}

/** What the stewards' confirmation of a result waits for, judged at one instant. */
export interface ConfirmationFacts {
  attemptId: number
  /** When each thing a protest may be lodged against was published (the signed timing sheet, the inspection). */
  published: number[]
  /** The attempt's frozen protest rule; null where its profile provides none (nothing to wait for). */
  rule: ProtestRule | null
  timeZone: string
  /** The protests and appeals of the event (any attempt's; only this one's count), decided or not. */
  protests: { id: number, attemptId: number, appealOf: number | null, decidedAt: string | Date | null }[]
}

/**
 * The instant from which a result may be confirmed: once the protest period of everything published has ended and,
 * for each decided protest nobody appealed, the appeal period too (a result stays provisional while it can still be
 * protested or appealed: sporting codes, common practice). Null where nothing was published yet.
 */
export function confirmableAfter(f: ConfirmationFacts): number | null {
  if (!f.published.length) return null
  if (!f.rule) return Math.max(...f.published)
  const ends = f.published.map(p => deadlineAfter(p, f.rule!.lodge, f.timeZone))
  if (f.rule.appeal) {
    const appeal = f.rule.appeal.deadline
    for (const p of f.protests.filter(x => x.attemptId === f.attemptId && !x.appealOf && x.decidedAt)) {
      if (f.protests.some(a => a.appealOf === p.id)) continue
      ends.push(deadlineAfter(new Date(p.decidedAt!).getTime(), appeal, f.timeZone))
    }
  }
  return Math.max(...ends)
}

/**
 * Why the stewards may not confirm the result at `now`, in words; empty when they may. A protest lodged at its
 * deadline is in time (lodging refuses only after it), so the result is confirmed only after that instant.
 */
export function confirmationWaits(f: ConfirmationFacts, now: number): string[] {
  const waits: string[] = []
  const after = confirmableAfter(f)
  if (after === null) waits.push('the result is not published yet: its timing sheet is not signed')
  else if (now <= after) {
    waits.push(`the protest and appeal periods run until ${clockTime(after, f.timeZone)}`)
  }
  for (const p of f.protests.filter(x => x.attemptId === f.attemptId && !x.decidedAt)) {
    waits.push(`${p.appealOf ? 'appeal' : 'protest'} #${p.id} is not decided`)
  }
  return waits
}
