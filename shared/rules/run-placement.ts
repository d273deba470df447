import type { Direction } from '../constants'
import type { RuleProfile } from './profile'
import { localDate } from './zoned'

/** The entry's attempt a new run could join: its runs that count (not aborted), its window as computed. */
export interface OpenAttempt {
  id: number
  runs: { id: number, direction: Direction, startedAtMs: number }[]
  /** The last instant the second run may start (or finish) by the profile's window; null while unknown. */
  windowDeadlineMs: number | null
  /** A next-day window: the first instant the second run may start. */
  windowOpensMs: number | null
}

/** Where a run about to start goes: into the open attempt as its second run, or a new attempt, with why. */
export type Placement
  = | { joins: number, message: string }
    | { joins: null, message: string, closes: number | null }

/** An elapsed window's close: known from the first run's start alone, else as the attempt's evaluation computed it. */
function deadline(w: Extract<RuleProfile['window']['value'], { kind: 'elapsed' }>, open: OpenAttempt) {
  if (w.from === 'start-first') return open.runs[0]!.startedAtMs + w.minutes * 60_000
  return open.windowDeadlineMs
}

const other = (d: Direction): Direction => (d === 'out' ? 'back' : 'out')

/**
 * Where a new run goes. It pairs with the entry's open attempt only when the pair it makes can
 * count: the direction the profile asks of the second run, and a start inside the profile's window
 * (or, where the window cannot be known yet, on the same day in the event's zone). Otherwise it
 * starts a new attempt and says why, so that runs far apart or in the same direction are never paired
 * silently. The earlier attempt keeps its one run, as it happened.
 */
export function placeRun(
  profile: Pick<RuleProfile, 'runs' | 'window'>,
  open: OpenAttempt | null,
  run: { direction: Direction, startedAtMs: number },
  timeZone: string,
): Placement {
  const fresh = 'This run starts a new attempt.'
  if (!open || !open.runs.length) {
    return open
      ? { joins: open.id, message: `This run is the first of attempt #${open.id}.` }
      : { joins: null, closes: null, message: fresh }
  }
  const first = open.runs[0]!
  const wanted = profile.runs.value.directions === 'opposite' ? other(first.direction) : first.direction
  const restart = (why: string) => ({
    joins: null,
    closes: open.id,
    message: `${fresh} ${why} Attempt #${open.id} keeps its one run (#${first.id}, ${first.direction}).`,
  })
  if (run.direction !== wanted) {
    return restart(profile.runs.value.directions === 'opposite'
      ? `Attempt #${open.id} has its ${first.direction} run already; its second run must go ${wanted}.`
      : `Both runs of a pair go the same way under this profile; attempt #${open.id} went ${first.direction}.`)
  }
  const w = profile.window.value
  if (w.kind === 'next-day') {
    if (open.windowDeadlineMs !== null && run.startedAtMs > open.windowDeadlineMs) {
      return restart(`It starts after attempt #${open.id}'s window closed.`)
    }
  }
  else if (deadline(w, open) !== null) {
    // An elapsed window closing at a finish is checked when the run finishes; a start already past it cannot pair.
    if (run.startedAtMs > deadline(w, open)!) {
      return restart(`It starts after attempt #${open.id}'s window of ${w.minutes} min closed.`)
    }
  }
  else if (localDate(run.startedAtMs, timeZone) !== localDate(first.startedAtMs, timeZone)) {
    return restart(`Attempt #${open.id}'s run was on another day.`)
  }
  return {
    joins: open.id,
    message: `This run is the ${wanted} run of attempt #${open.id}, pairing with run #${first.id}.`,
  }
}
