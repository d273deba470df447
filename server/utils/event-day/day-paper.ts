import { localDate, localDateTime } from '#shared/rules/zoned'

type LiveAttempt = ReturnType<typeof computeLive>[number]
type LiveRun = LiveAttempt['runs'][number]

const clock = (iso: string, zone: string) => localDateTime(Date.parse(iso), zone).slice(11, 19)

/** A run of the day as the paper shows it: its place in the order, who ran, and its figures. */
function runLine(a: LiveAttempt, r: LiveRun, order: number, zone: string) {
  return {
    order,
    runId: r.id,
    attemptId: a.id,
    startedAt: clock(r.startedAt, zone),
    teamName: a.entry.teamName,
    machineName: a.entry.machineName,
    riderName: a.entry.riderName,
    className: a.entry.className,
    direction: r.direction,
    start: r.start,
    status: r.status,
    distance: a.entry.distanceLabel,
    timeS: r.official?.timeS ?? null,
    kmh: r.official?.kmh ?? null,
    mph: r.official?.mph ?? null,
  }
}

/**
 * The paper of one day at an event, in its zone: the start list (every entry), the run order (every run
 * that left the line that day, in order), and the results by class (each attempt that ran that day, with
 * the result of every distance it claims). One reading of the event, as the live results compute it.
 */
export async function dayPaper(eventId: number, date?: string) {
  const day = await loadEventDay(eventId)
  const zone = day.event.timeZone
  const on = date ?? localDate(Date.now(), zone)
  const live = computeLive(day)
  const ofDay = live
    .flatMap(a => a.runs.map(r => ({ a, r })))
    .filter(x => localDate(Date.parse(x.r.startedAt), zone) === on)
    .sort((x, y) => x.r.startedAt.localeCompare(y.r.startedAt))
  const attempts = live.filter(a => ofDay.some(x => x.a.id === a.id))
  const classes = [...new Set(attempts.map(a => a.entry.className))].sort()
  return {
    event: { id: day.event.id, name: day.event.name, venue: day.event.venue, timeZone: zone },
    date: on,
    traps: [...day.traps].sort((a, b) => Number(a.positionM) - Number(b.positionM)).map(t => t.label),
    systems: day.systems.map(s => ({ name: s.name, role: s.role, ticksPerSecond: s.ticksPerSecond })),
    startList: day.entries.map(e => ({
      entryId: e.entry.id,
      teamName: e.teamName,
      machineName: e.machine.name,
      riderName: e.rider.name,
      className: e.entry.className,
      distances: e.entry.distanceIds.map(id => day.distances.find(d => d.id === id)?.label ?? '').join(', '),
    })),
    runOrder: ofDay.map((x, i) => runLine(x.a, x.r, i + 1, zone)),
    results: classes.map(className => ({
      className,
      attempts: attempts.filter(a => a.entry.className === className).map(a => ({
        attemptId: a.id,
        teamName: a.entry.teamName,
        machineName: a.entry.machineName,
        riderName: a.entry.riderName,
        signed: a.sheet.locked,
        distances: a.distances.map(d => ({
          label: d.label,
          kmh: d.result?.kmh ?? null,
          mph: d.result?.mph ?? null,
          valid: d.valid,
          beatsRecord: d.beatsRecord,
          record: d.standingRecord ? `${d.standingRecord.speed} ${d.standingRecord.unit}` : null,
        })),
      })),
    })),
  }
}
export type DayPaper = Awaited<ReturnType<typeof dayPaper>>

/**
 * A run's time slip: what the team carries to the impound and keeps. The run, its times at every trap by
 * each system, and its time and speed over every distance its entry claims (each from the same readings).
 */
export async function timeSlip(access: EventAccess & { recordId: number }) {
  const runId = access.recordId
  const whole = await loadEventDay(access.eventId)
  const attemptId = whole.runs.find(r => r.id === runId)?.attemptId
  if (!attemptId) throw notFound('No such run')
  // A team reads its own runs' slips only: checked before anything is computed.
  await assertOwnAttempt(access, attemptId)
  // Only this attempt is computed (once with its readings, once more per other distance it claims).
  const day = { ...whole, attempts: whole.attempts.filter(a => a.id === attemptId) }
  const zone = day.event.timeZone
  const attempt = computeLive(day, { readings: true })[0]!
  const run = attempt.runs.find(r => r.id === runId)!
  const trapLabel = new Map(day.traps.map(t => [t.id, t.label]))
  const distances = attempt.distances.map((d) => {
    const shown = d.distanceId === attempt.entry.distanceId
      ? attempt
      : computeLive(day, { distanceId: d.distanceId })[0]!
    const official = shown.runs.find(r => r.id === runId)?.official ?? null
    return { label: d.label, timeS: official?.timeS ?? null, kmh: official?.kmh ?? null, mph: official?.mph ?? null }
  })
  return {
    event: { name: day.event.name, venue: day.event.venue, timeZone: zone },
    run: {
      id: run.id,
      attemptId: attempt.id,
      direction: run.direction,
      start: run.start,
      status: run.status,
      abortedReason: run.abortedReason,
      startedAt: localDateTime(Date.parse(run.startedAt), zone),
    },
    entry: {
      teamName: attempt.entry.teamName,
      machineName: attempt.entry.machineName,
      riderName: attempt.entry.riderName,
      className: attempt.entry.className,
    },
    readings: day.systems.map(s => ({
      system: s.name,
      role: s.role,
      times: run.readings.filter(g => g.systemId === s.id)
        .map(g => ({ trap: trapLabel.get(g.trapId) ?? '', time: g.time })),
    })),
    distances,
    findings: run.findings.map(f => ({ severity: f.severity, message: f.message })),
    sheetSigned: attempt.sheet.locked,
    printedAt: localDateTime(Date.now(), zone),
  }
}
export type TimeSlip = Awaited<ReturnType<typeof timeSlip>>
