import { max, mul, q, sub, toFixed, toNumber, ZERO, type Q } from './exact'
import { finishMs } from './attempt-window'
import type { RunInput, WindowState } from './attempt-types'

export interface LeaveBy {
  /** The latest instant the machine can leave the start line for the return run (epoch ms). */
  atMs: number
  /** What it rests on: the window's closing instant and, where the window closes at the finish, the run. */
  deadlineMs: number
  closesAt: 'start' | 'finish'
  /** Start line to entry trap, as on the first run; null where the window closes at the start. */
  runUpS: string | null
  /** Time over the measured distance assumed for the return run; null where the window closes at the start. */
  overDistanceS: string | null
  /** Whether the time over the distance is the longest that still beats the record, or the first run's. */
  overDistanceBasis: 'record' | 'first-run' | null
  /** True when the first run gives no instant it left the distance: its run-up is not known, taken as zero. */
  runUpUnknown: boolean
}

/**
 * When the machine must leave the line for the return run, after the first run of a pair. A window that
 * closes at the return run's start gives that instant itself. One that closes at its finish (the instant
 * it leaves the measured distance) takes away the run-up, as long as the first run's (start line to entry
 * trap), and the time over the distance: the longest that still beats the record where one stands (a
 * faster run takes less), else the first run's.
 */
export function leaveBy(
  window: WindowState,
  first: RunInput,
  returnTargetS: Q | null,
  timeDecimals: number,
): LeaveBy | null {
  if (window.deadlineMs === null || !window.closingAnchor?.endsWith('second')) return null
  const deadline = q(BigInt(window.deadlineMs))
  if (window.closingAnchor === 'start-second') {
    return {
      atMs: window.deadlineMs,
      deadlineMs: window.deadlineMs,
      closesAt: 'start',
      runUpS: null,
      overDistanceS: null,
      overDistanceBasis: null,
      runUpUnknown: false,
    }
  }
  const runUpUnknown = first.finishedAtMs === undefined
  const runUpMs = runUpUnknown
    ? ZERO
    : max(ZERO, sub(sub(finishMs(first), q(BigInt(first.startedAtMs))), mul(first.elapsedS, q(1000n))))
  const over = returnTargetS ?? first.elapsedS
  const overMs = mul(over, q(1000n))
  const at = sub(sub(deadline, runUpMs), overMs)
  return {
    atMs: Math.floor(toNumber(at)),
    deadlineMs: window.deadlineMs,
    closesAt: 'finish',
    runUpS: toFixed(mul(runUpMs, q(1n, 1000n)), timeDecimals, 'truncate'),
    overDistanceS: toFixed(over, timeDecimals, 'truncate'),
    overDistanceBasis: returnTargetS ? 'record' : 'first-run',
    runUpUnknown,
  }
}
