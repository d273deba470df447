import { add, cmp, div, q, type Q } from './exact'

/**
 * A time of day read at a trap, kept as an integer count of the timing system's ticks since
 * midnight (a resolution of 1000 ticks per second is 1/1000 s). Never a float.
 */
export interface TrapReading {
  trapPositionM: Q
  ticks: bigint
}

/**
 * A time of day as typed: H:MM:SS or HH:MM:SS with up to six decimals. The schemas use it (`timeOfDay`); the run
 * sheet's cells check it with no schema library, so that the page's first visit does not carry one.
 */
export const TIME_OF_DAY = /^\d{1,2}:\d{2}:\d{2}(\.\d{1,6})?$/
export const TIME_OF_DAY_ERROR = 'must be a time of day, HH:MM:SS.fff'

/** Parses "HH:MM:SS.fff…" into ticks; refuses more digits than the system resolves. */
export function parseTimeOfDay(text: string, ticksPerSecond: bigint): bigint {
  const m = /^(\d{1,2}):(\d{2}):(\d{2})(?:\.(\d+))?$/.exec(text.trim())
  if (!m) throw new SyntaxError(`not a time of day (HH:MM:SS.fff): ${JSON.stringify(text)}`)
  const [h, mi, s] = [Number(m[1]), Number(m[2]), Number(m[3])]
  if (h > 23 || mi > 59 || s > 59) throw new RangeError(`time of day out of range: ${text}`)
  const frac = m[4] ?? ''
  const fracQ = frac ? q(BigInt(frac), 10n ** BigInt(frac.length)) : q(0n)
  const ticksQ = add(q(BigInt(h * 3600 + mi * 60 + s) * ticksPerSecond), q(fracQ.n * ticksPerSecond, fracQ.d))
  if (ticksQ.d !== 1n) throw new RangeError(`more decimals than the timing system resolves: ${text}`)
  return ticksQ.n
}

export function formatTimeOfDay(ticks: bigint, ticksPerSecond: bigint): string {
  const whole = ticks / ticksPerSecond
  const rest = ticks % ticksPerSecond
  const places = ticksPerSecond.toString().length - 1
  const pad = (x: bigint) => x.toString().padStart(2, '0')
  const hh = whole / 3600n
  const mm = (whole % 3600n) / 60n
  const ss = whole % 60n
  return `${pad(hh)}:${pad(mm)}:${pad(ss)}` + (places ? '.' + rest.toString().padStart(places, '0') : '')
}

/** Segment time between two readings of one timing system, exactly, in seconds. */
export function segmentTime(entryTicks: bigint, exitTicks: bigint, ticksPerSecond: bigint): Q {
  if (exitTicks <= entryTicks) throw new RangeError('the exit trap must be broken after the entry trap')
  return q(exitTicks - entryTicks, ticksPerSecond)
}

/** Speed in m/s over a measured distance in metres covered in a time in seconds. */
export function speed(distanceM: Q, timeS: Q): Q {
  if (cmp(timeS, q(0n)) <= 0) throw new RangeError('time must be positive')
  return div(distanceM, timeS)
}

/**
 * A time of day as typed on a phone's number keypad, which has no colon: "182440.1000" (or "182440,1000")
 * is 18:24:40.1000, and "92440.5" is 09:24:40.5. Anything else is given back as typed, for the schema to
 * judge. `readAs` says how a compact time was read, to show beside the cell.
 */
export function readTypedTime(text: string): { time: string, readAs: string | null } {
  const t = text.trim()
  const m = /^(\d{5,6})(?:[.,](\d{1,6}))?$/.exec(t)
  if (!m) return { time: t.replace(/^(\d{1,2}:\d{2}:\d{2}),(\d+)$/, '$1.$2'), readAs: null }
  const digits = m[1]!.padStart(6, '0')
  const time = `${digits.slice(0, 2)}:${digits.slice(2, 4)}:${digits.slice(4, 6)}${m[2] ? `.${m[2]}` : ''}`
  return { time, readAs: `${t} read as ${time}` }
}
