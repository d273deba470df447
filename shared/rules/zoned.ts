// Calendar days in a named time zone, with the platform's Intl data only (no clock is read).

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string) {
  let f = formatters.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-CA', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    })
    formatters.set(timeZone, f)
  }
  return f
}

export function isTimeZone(timeZone: string): boolean {
  try {
    formatter(timeZone)
    return true
  }
  catch {
    return false
  }
}

function parts(ms: number, timeZone: string) {
  const p = Object.fromEntries(
    formatter(timeZone)
      .formatToParts(new Date(ms))
      .map(x => [x.type, x.value]),
  )
  return {
    y: Number(p.year),
    m: Number(p.month),
    d: Number(p.day),
    h: Number(p.hour),
    mi: Number(p.minute),
    s: Number(p.second),
  }
}

/** The local date and time, "YYYY-MM-DD hh:mm:ss", as a clock in the zone shows it. */
export function localDateTime(ms: number, timeZone: string): string {
  const { y, m, d, h, mi, s } = parts(ms, timeZone)
  const two = (n: number) => String(n).padStart(2, '0')
  return `${y}-${two(m)}-${two(d)} ${two(h)}:${two(mi)}:${two(s)}`
}

/** The local calendar date, YYYY-MM-DD. */
export function localDate(ms: number, timeZone: string): string {
  const { y, m, d } = parts(ms, timeZone)
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`
}

function offsetMs(ms: number, timeZone: string) {
  const { y, m, d, h, mi, s } = parts(ms, timeZone)
  return Date.UTC(y, m - 1, d, h, mi, s) - Math.floor(ms / 1000) * 1000
}

/** The instant of local midnight that starts a date (YYYY-MM-DD) in a time zone. */
export function localMidnight(date: string, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  const guess = Date.UTC(y, m - 1, d)
  let t = guess - offsetMs(guess, timeZone)
  t = guess - offsetMs(t, timeZone)
  return t
}

export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10)
}

/** The instant of a wall-clock time ("YYYY-MM-DDTHH:MM[:SS[.fff]]") in a time zone, epoch ms. */
export function localToInstant(local: string, timeZone: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?$/.exec(local)
  if (!m) throw new SyntaxError(`not a local date and time: ${local}`)
  const [y, mo, d, h, mi] = m.slice(1, 6).map(Number) as [number, number, number, number, number]
  const s = Number(m[6] ?? 0)
  const ms = Number((m[7] ?? '0').padEnd(3, '0'))
  const guess = Date.UTC(y, mo - 1, d, h, mi, s, ms)
  let t = guess - offsetMs(guess, timeZone)
  t = guess - offsetMs(t, timeZone)
  return t
}

/** A wall-clock time as naive epoch ms (the same figures read as UTC): "YYYY-MM-DDTHH:MM[:SS[.fff]]". */
function naiveMs(local: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?$/.exec(local)
  if (!m) throw new SyntaxError(`not a local date and time: ${local}`)
  const [y, mo, d, h, mi] = m.slice(1, 6).map(Number) as [number, number, number, number, number]
  return Date.UTC(y, mo - 1, d, h, mi, Number(m[6] ?? 0), Number((m[7] ?? '0').padEnd(3, '0')))
}

/**
 * Every instant at which a clock in the zone shows this wall-clock time, earliest first: one on most days, none
 * in the hour skipped when the clocks go forward, two in the hour repeated when they go back (also for a change
 * of 30 minutes, as on Lord Howe Island). The zone's offsets either side of the time are tried.
 */
export function wallClockInstants(local: string, timeZone: string): number[] {
  const naive = naiveMs(local)
  const tried = [naive - 86_400_000, naive + 86_400_000].map(around => naive - offsetMs(around, timeZone))
  // Earliest first already: two instants exist only where the offset drops (the clocks go back), so the one found
  // with the earlier (larger) offset is the earlier instant. One offset found twice is one instant.
  return [...new Set(tried.filter(t => t + offsetMs(t, timeZone) === naive))]
}

/** A time of day in ms (0 ≤ ms < 1 day) as a wall-clock time on a date: "YYYY-MM-DDTHH:MM:SS.fff". */
export function onDate(date: string, ofDayMs: number): string {
  return `${date}T${new Date(ofDayMs).toISOString().slice(11, 23)}`
}

/**
 * The instant nearest `nearMs` at which the zone's clock shows this time of day (ms since the clock's midnight):
 * a reading's time of day placed by its run's start, so a run after midnight or in a repeated hour finds its own
 * instant (a run lasts minutes; a start typed a little late still finds its readings). Null only where the time
 * exists on none of the three days around (never, in practice).
 */
export function nearestTimeOfDay(ofDayMs: number, nearMs: number, timeZone: string): number | null {
  const day = localDate(nearMs, timeZone)
  const candidates = [-1, 0, 1].flatMap(k => wallClockInstants(onDate(addDays(day, k), ofDayMs), timeZone))
  if (!candidates.length) return null
  return candidates.reduce((best, t) => (Math.abs(t - nearMs) < Math.abs(best - nearMs) ? t : best))
}
