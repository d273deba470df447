// A timing device's own event list (one line per passing: channel, time of day, optionally a date and a
// sequence number) read through a channel map and given to the runs it belongs to. Pure: the server
// passes the event's runs and traps, the page shows the same assignment before anything is written.
import Papa from 'papaparse'
import { parseTimeOfDay } from './timing'
import { addDays, onDate, wallClockInstants } from './zoned'

export interface DeviceLayout {
  delimiter: 'auto' | ',' | ';' | '\t' | '|'
  /** Whether the first line names the columns; without it, columns are numbered from 1. */
  header: boolean
  columns: { channel: string, time: string, date?: string, sequence?: string }
  channels: { channel: string, trapId: number }[]
}

export interface DevicePassing {
  line: number
  channel: string
  time: string
  date?: string
  sequence?: number
}

export interface ParsedDeviceFile {
  passings: DevicePassing[]
  /** Lines that cannot be read at all (a missing column, an unreadable number). */
  problems: { line: number, message: string }[]
}

/** Reads the file's lines by the layout. */
export function readDeviceFile(text: string, layout: Omit<DeviceLayout, 'channels'>): ParsedDeviceFile {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, '').trim(), {
    delimiter: layout.delimiter === 'auto' ? '' : layout.delimiter,
    skipEmptyLines: true,
  })
  const rows = parsed.data
  const head = layout.header ? (rows[0] ?? []).map(h => h.trim()) : []
  const indexOf = (column: string | undefined) => {
    if (!column) return -1
    if (layout.header) return head.indexOf(column)
    const n = Number(column)
    return Number.isInteger(n) && n >= 1 ? n - 1 : -1
  }
  const at = {
    channel: indexOf(layout.columns.channel),
    time: indexOf(layout.columns.time),
    date: indexOf(layout.columns.date),
    sequence: indexOf(layout.columns.sequence),
  }
  const problems: ParsedDeviceFile['problems'] = []
  for (const [name, i] of Object.entries(at) as [keyof typeof at, number][]) {
    if (i < 0 && (name === 'channel' || name === 'time' || layout.columns[name])) {
      const what = layout.header
        ? `no column "${layout.columns[name]}" in the first line (${head.join(', ')})`
        : `column ${layout.columns[name]} is not a column number (1, 2, …)`
      problems.push({ line: 1, message: `${name}: ${what}` })
    }
  }
  if (problems.length) return { passings: [], problems }
  const passings: DevicePassing[] = []
  rows.slice(layout.header ? 1 : 0).forEach((row, i) => {
    const line = i + (layout.header ? 2 : 1)
    const cell = (k: number) => (k >= 0 ? (row[k] ?? '').trim() : '')
    if (!cell(at.channel) || !cell(at.time)) {
      problems.push({ line, message: 'no channel or no time on this line' })
      return
    }
    const sequence = at.sequence >= 0 ? Number(cell(at.sequence)) : undefined
    if (sequence !== undefined && !Number.isInteger(sequence)) {
      problems.push({ line, message: `the sequence number "${cell(at.sequence)}" is not a whole number` })
      return
    }
    passings.push({
      line,
      channel: cell(at.channel),
      time: cell(at.time),
      ...(at.date >= 0 ? { date: cell(at.date) } : {}),
      ...(sequence !== undefined ? { sequence } : {}),
    })
  })
  return { passings, problems }
}

export interface CandidateRun {
  id: number
  courseId: number
  startedAtMs: number
  /** Why the run takes no readings (aborted, its sheet signed); null when it does. */
  closed: string | null
  /** Traps that already have a time from this timing system on this run. */
  taken: number[]
}

export interface TrapOnCourse {
  id: number
  courseId: number
  label: string
}

export interface Assigned {
  line: number
  channel: string
  runId: number
  trapId: number
  trapLabel: string
  ticks: bigint
  time: string
  atMs: number
}

export interface Unmatched {
  line: number
  channel: string
  time: string
  reason: string
}

/** A passing more than this long after its run's start belongs to no run: a run is over in minutes. */
export const MAX_AFTER_START_MS = 30 * 60_000
const HALF_DAY_MS = 12 * 3_600_000

const ISO_DAY = /^\d{4}-\d{2}-\d{2}$/
const DOTTED_DAY = /^(\d{2})[./](\d{2})[./](\d{4})$/

/** A device's date as YYYY-MM-DD: ISO, or day.month.year (or with slashes); null when unreadable. */
export function deviceDate(text: string): string | null {
  if (ISO_DAY.test(text)) return text
  const m = DOTTED_DAY.exec(text)
  return m ? `${m[3]}-${m[2]}-${m[1]}` : null
}

/** The passings in the device's order: by sequence number where every line has one, else as written. */
function inDeviceOrder(passings: DevicePassing[]) {
  return passings.every(p => p.sequence !== undefined)
    ? [...passings].sort((a, b) => a.sequence! - b.sequence!)
    : passings
}

/**
 * Gives each passing to a run: the one on the trap's course that started last before it (and less than
 * 30 min before), so a run's passings fall between its start and the next run's. A time of day with no
 * date is on `firstDay`, the next day after the clock goes back past midnight (an earlier time of day,
 * by more than 12 h, than the passing before it). A channel not in the map, a passing no run can take,
 * and a trap met twice on one run are listed, never guessed.
 */
export function assignPassings(input: {
  passings: DevicePassing[]
  channels: DeviceLayout['channels']
  traps: TrapOnCourse[]
  runs: CandidateRun[]
  ticksPerSecond: number
  timeZone: string
  firstDay: string
}) {
  const trapOf = new Map(input.channels.map(c => [c.channel, input.traps.find(t => t.id === c.trapId)]))
  const runs = [...input.runs].sort((a, b) => a.startedAtMs - b.startedAtMs)
  const assigned: Assigned[] = []
  const unmatched: Unmatched[] = []
  let day = input.firstDay
  let lastMs: number | null = null
  let lastAtMs: number | null = null
  for (const p of inDeviceOrder(input.passings)) {
    const refuse = (reason: string) => unmatched.push({ line: p.line, channel: p.channel, time: p.time, reason })
    let ticks: bigint
    try {
      ticks = parseTimeOfDay(p.time, BigInt(input.ticksPerSecond))
    }
    catch (e) {
      refuse(`the time cannot be read: ${(e as Error).message}`)
      continue
    }
    const ofDayMs = Number(ticks * 1000n / BigInt(input.ticksPerSecond))
    if (p.date !== undefined) {
      const d = deviceDate(p.date)
      if (!d) {
        refuse(`the date "${p.date}" cannot be read (YYYY-MM-DD or DD.MM.YYYY)`)
        continue
      }
      day = d
    }
    else if (lastMs !== null && ofDayMs < lastMs - HALF_DAY_MS) {
      day = addDays(day, 1)
    }
    lastMs = ofDayMs
    const trap = trapOf.get(p.channel)
    if (!trap) {
      refuse(`channel ${p.channel} is not in the channel map`)
      continue
    }
    // The device's clock shows the event's wall-clock time. In the hour repeated when the clocks go back it is the
    // first instant, not before the passing before it (the device writes in order), that a run can take; none
    // exists in the hour skipped when they go forward.
    const all = wallClockInstants(onDate(day, ofDayMs), input.timeZone)
    const inOrder = all.filter(t => lastAtMs === null || t >= lastAtMs)
    const instants = all.length > 1 && inOrder.length ? inOrder : all
    const runAt = (t: number) => runs.filter(r => r.courseId === trap.courseId && r.startedAtMs <= t).at(-1)
    const atMs = instants.find(t => runAt(t) && t - runAt(t)!.startedAtMs <= MAX_AFTER_START_MS) ?? instants[0]
    if (atMs === undefined) {
      refuse(`${p.time} did not exist on ${day} in ${input.timeZone}: the clocks skipped that hour`)
      continue
    }
    lastAtMs = atMs
    const run = runAt(atMs)
    if (!run) {
      refuse(`before any run on ${trap.label}'s course started`)
      continue
    }
    if (atMs - run.startedAtMs > MAX_AFTER_START_MS) {
      refuse(`more than 30 min after run ${run.id} started, and no later run had started`)
      continue
    }
    if (run.closed) {
      refuse(`run ${run.id} ${run.closed}`)
      continue
    }
    if (run.taken.includes(trap.id)) {
      refuse(`${trap.label} on run ${run.id} already has a time from this system; correct it on the run sheet`)
      continue
    }
    assigned.push({
      line: p.line,
      channel: p.channel,
      runId: run.id,
      trapId: trap.id,
      trapLabel: trap.label,
      ticks,
      time: p.time,
      atMs,
    })
  }
  return twiceOnARun(assigned, unmatched)
}

/** A trap met twice on one run: neither passing is taken, both are listed. */
function twiceOnARun(assigned: Assigned[], unmatched: Unmatched[]) {
  const key = (a: Assigned) => `${a.runId}/${a.trapId}`
  const count = new Map<string, Assigned[]>()
  for (const a of assigned) count.set(key(a), [...(count.get(key(a)) ?? []), a])
  const kept: Assigned[] = []
  for (const a of assigned) {
    const same = count.get(key(a))!
    if (same.length === 1) {
      kept.push(a)
      continue
    }
    const lines = same.map(x => x.line).join(' and ')
    unmatched.push({
      line: a.line,
      channel: a.channel,
      time: a.time,
      reason: `${a.trapLabel} twice on run ${a.runId} (lines ${lines}): which one counts is for the timekeeper`,
    })
  }
  return { assigned: kept, unmatched: unmatched.sort((a, b) => a.line - b.line) }
}
