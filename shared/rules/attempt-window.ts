import { add, cmp, div, mul, q, sub, toFixed, toNumber, type Q } from './exact'
import type { Finding } from './findings'
import { describeWindow, type RuleProfile, type WindowAnchor } from './profile'
import { ruleOf, type RunInput, type WindowState } from './attempt-types'
import { addDays, localDate, localMidnight, localToInstant } from './zoned'

/** A run's finish: the instant it left the measured distance, or at least its start plus the time over it. */
export function finishMs(run: RunInput): Q {
  if (run.finishedAtMs !== undefined) return q(BigInt(Math.round(run.finishedAtMs)))
  return add(q(BigInt(run.startedAtMs)), mul(run.elapsedS, q(1000n)))
}

function anchorMs(anchor: WindowAnchor, runs: RunInput[]): Q | null {
  const run = anchor.endsWith('first') ? runs[0] : runs[1]
  if (!run) return null
  return anchor.startsWith('start') ? q(BigInt(run.startedAtMs)) : finishMs(run)
}

/**
 * Next-day rules: the record run starts on the calendar day after the qualifying run, in the event's
 * zone, and before the profile's local time of day where it names one (the next morning), and no sooner than the
 * profile's overnight minimum after the qualifying run.
 */
function nextDayWindow(rule: string, runs: RunInput[], timeZone: string, before?: string,
  overnightMinutes = 0): WindowState {
  const first = runs[0]!
  const day = addDays(localDate(first.startedAtMs, timeZone), 1)
  // The next day's midnight, or the end of the overnight minimum where that is later (a qualifier at 23:59).
  const opensMs = Math.max(localMidnight(day, timeZone), first.startedAtMs + overnightMinutes * 60_000)
  const closesMs = before ? localToInstant(`${day}T${before}`, timeZone) : localMidnight(addDays(day, 1), timeZone)
  const deadlineMs = closesMs - 1
  const second = runs[1]
  const ok = !second || (second.startedAtMs >= opensMs && second.startedAtMs <= deadlineMs)
  return { ok, rule, usedS: null, deadlineMs, opensMs, closingAnchor: 'start-second' }
}

export function evaluateWindow(profile: RuleProfile, runs: RunInput[], timeZone: string): WindowState {
  const w = profile.window.value
  const rule = describeWindow(w)
  if (w.kind === 'next-day') return nextDayWindow(rule, runs, timeZone, w.before, w.overnightMinutes)
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

export function windowFindings(profile: RuleProfile, window: WindowState, runs: RunInput[] = []): Finding[] {
  const w = profile.window.value
  const runAt = (anchor: WindowAnchor) => runs[anchor.endsWith('first') ? 0 : 1]
  // A finish anchor of a run whose readings do not give the instant it left the distance.
  const anchoredAtFinish = w.kind !== 'next-day' && [w.from, w.to]
    .some(a => a.startsWith('finish') && runAt(a) !== undefined && runAt(a)!.finishedAtMs === undefined)
  const estimated: Finding[] = anchoredAtFinish
    ? [{
        code: 'window.estimated',
        severity: 'warn',
        message: 'A run\'s finish is estimated as its start plus the time over the distance, which leaves out '
          + 'the run-up: the window is checked against an earlier finish than the true one.',
        rule: ruleOf(profile, 'window', 'Time window', window.rule),
      }]
    : []
  if (window.ok) return estimated
  const minutes = window.usedS ? toFixed(div(window.usedS, q(60n)), 1, 'truncate') : ''
  return [{
    code: 'window.exceeded',
    severity: 'fail',
    message: profile.window.value.kind === 'next-day'
      ? `The record run is not within the window: ${window.rule}.`
      : `The runs took ${minutes} min between the anchors; the window is ${window.rule}.`,
    rule: ruleOf(profile, 'window', 'Time window', window.rule),
  }, ...estimated]
}
