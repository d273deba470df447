import { evaluateAttempt, type AttemptResult } from '#shared/rules/attempt'
import { cmp, fromDecimal, toFixed } from '#shared/rules/exact'
import { computeRun } from '#shared/rules/run-sheet'
import { formatTimeOfDay } from '#shared/rules/timing'
import { checkMeasuredDistance } from '#shared/rules/course'
import { blocks, withSetAsides, type Finding } from '#shared/rules/findings'
import { publishedInMs } from '#shared/rules/units'
import { addDays, localDate, localMidnight } from '#shared/rules/zoned'
import type { EventDay } from './load'

const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString())

type SignatureRow = EventDay['signatures'][number]
const sheetAct = (x: SignatureRow) => ({
  id: x.s.id,
  kind: x.s.kind,
  by: x.signerName,
  typedName: x.s.typedName,
  at: x.s.signedAt,
  sha256: x.s.contentSha256,
  reason: x.s.reason,
  method: x.s.method,
})

/** The state of each attempt's timing sheet from its signature chain. */
export function sheetState(day: EventDay, attemptId: number) {
  const chain = day.signatures.filter(x => x.s.subjectId === attemptId && x.s.kind.startsWith('timing-sheet'))
  const latest = chain.at(-1)
  return {
    locked: latest?.s.kind === 'timing-sheet',
    latest: latest ? sheetAct(latest) : null,
    history: chain.map(sheetAct),
  }
}

/** The day's rows indexed once, for computing every attempt. */
function indexDay(day: EventDay) {
  const readingsByRun = new Map<number, EventDay['readings']>()
  for (const r of day.readings) {
    if (r.current) readingsByRun.set(r.runId, [...(readingsByRun.get(r.runId) ?? []), r])
  }
  return {
    day,
    entryById: new Map(day.entries.map(e => [e.entry.id, e])),
    distanceById: new Map(day.distances.map(d => [d.id, d])),
    courseById: new Map(day.courses.map(c => [c.id, c])),
    weatherByRun: new Map(day.weather.map(w => [w.runId, w])),
    readingsByRun,
    systems: day.systems.map(({ id, name, role, ticksPerSecond, toleranceS }) =>
      ({ id, name, role, ticksPerSecond, toleranceS })),
    tpsOf: new Map(day.systems.map(s => [s.id, BigInt(s.ticksPerSecond)])),
    timeDecimals: Math.max(3, ...day.systems.map(s => String(s.ticksPerSecond).length - 1)),
  }
}
type DayIndex = ReturnType<typeof indexDay>
type Attempt = EventDay['attempts'][number]

/**
 * The record an attempt is measured against: the fastest for its class and distance that stood when
 * its first run started (a result ratified later does not count against it; one entered by hand always
 * stands).
 */
function recordStandingAt(ix: DayIndex, attempt: Attempt, className: string, distanceLabel: string) {
  const firstRun = ix.day.runs.find(r => r.attemptId === attempt.id)
  const from = firstRun?.startedAt.getTime() ?? Number.POSITIVE_INFINITY
  return ix.day.records
    .filter(r => r.className === className && r.distanceLabel === distanceLabel)
    // A record set by this attempt's own ratification is never held against it.
    .filter(r => !r.setAt || (r.setAt.getTime() <= from && r.fromAttemptId !== attempt.id))
    .reduce<typeof ix.day.records[number] | undefined>(
      (best, r) => (!best || cmp(publishedInMs(r), publishedInMs(best)) > 0 ? r : best),
      undefined,
    )
}

/** What an attempt is about: its entry, measured distance, course and the standing record. */
function attemptSetting(ix: DayIndex, attempt: Attempt) {
  const e = ix.entryById.get(attempt.entryId)!
  const distance = ix.distanceById.get(e.entry.distanceId)!
  const course = ix.courseById.get(distance.courseId)!
  const setAsides = ix.day.setAsides
    .filter(s => s.attemptId === attempt.id)
    .map(s => ({ ...s, at: s.createdAt.toISOString() }))
  return { e, distance, course, setAsides, record: recordStandingAt(ix, attempt, e.entry.className, distance.label) }
}
type Setting = ReturnType<typeof attemptSetting>

/** Each run of the attempt through the run-sheet engine, with its official time over the distance. */
function computeRuns(ix: DayIndex, attempt: Attempt, { course, distance }: Setting) {
  const traps = ix.day.traps.filter(t => t.courseId === course.id)
  const distances = ix.day.distances.filter(d => d.courseId === course.id)
  return ix.day.runs.filter(r => r.attemptId === attempt.id).map((run) => {
    const readings = ix.readingsByRun.get(run.id) ?? []
    const weather = ix.weatherByRun.get(run.id)
    const c = computeRun({
      profile: attempt.profile,
      direction: run.direction,
      headingDeg: Number(course.headingDeg),
      traps,
      distances,
      systems: ix.systems,
      readings: readings.map(r => ({ id: r.id, trapId: r.trapId, systemId: r.systemId, ticks: r.ticks.toString() })),
      weather: weather ?? null,
    })
    return { run, c, official: c.official[distance.id], readings, weather }
  })
}
type ComputedRun = ReturnType<typeof computeRuns>[number]

/**
 * The instant a run left the measured distance: the time of day at its last trap (the exit trap out,
 * the entry trap back) on the system whose time counts, on the run's date in the event's zone, rolling
 * over midnight when the reading is earlier in the day than the start.
 */
function leftDistanceAt(ix: DayIndex, r: ComputedRun, distance: Setting['distance']) {
  const lastTrap = r.run.direction === 'out' ? distance.exitTrapId : distance.entryTrapId
  const reading = r.readings.find(g => g.trapId === lastTrap && g.systemId === r.official!.systemId)
  if (!reading) return undefined
  const zone = ix.day.event.timeZone
  const startMs = r.run.startedAt.getTime()
  const ofDay = Number(reading.ticks * 1000n / ix.tpsOf.get(reading.systemId)!)
  const day = localDate(startMs, zone)
  const sameDay = localMidnight(day, zone) + ofDay
  // An hour of slack for a start typed a little late; a reading earlier than that is after midnight.
  return sameDay >= startMs - 3_600_000 ? sameDay : localMidnight(addDays(day, 1), zone) + ofDay
}

/** Where the profile has a qualifying run: the impound check-in after it, null if none is recorded. */
function impoundCheckIn(ix: DayIndex, attempt: Attempt) {
  if (!attempt.profile.qualifying?.value) return undefined
  return ix.day.impounds.find(i => i.attemptId === attempt.id)?.checkedInAt.getTime() ?? null
}

/** The pair by the profile, from the first two runs that finished with an official time. */
function evaluateCounted(ix: DayIndex, attempt: Attempt, { distance, record }: Setting, counted: ComputedRun[]) {
  if (!counted.length) return null
  return evaluateAttempt({
    profile: attempt.profile,
    distanceM: fromDecimal(distance.nominalM),
    runs: counted.slice(0, 2).map(r => ({
      direction: r.run.direction,
      startedAtMs: r.run.startedAt.getTime(),
      elapsedS: r.official!.exactS,
      finishedAtMs: leftDistanceAt(ix, r, distance),
    })),
    // Compared in the unit the record was published in, at its exact decimal.
    record: record ? { value: fromDecimal(record.speed), unit: record.unit } : undefined,
    timeZone: ix.day.event.timeZone,
    timeDecimals: ix.timeDecimals,
    impoundCheckInMs: impoundCheckIn(ix, attempt),
  })
}

/** One run as the pages show it. */
function liveRun(
  ix: DayIndex,
  { distance, setAsides }: Setting,
  r: ComputedRun,
  counted: boolean,
  withReadings: boolean,
) {
  const { run, c, official, readings, weather } = r
  const officialFigures = official
    ? c.systems.find(s => s.systemId === official.systemId)!.distances.find(d => d.distanceId === distance.id)!
    : null
  const chartSystem = c.systems.find(s => s.role === 'primary') ?? c.systems[0]
  return {
    id: run.id,
    direction: run.direction,
    startedAt: run.startedAt.toISOString(),
    status: run.status,
    abortedReason: run.abortedReason,
    counted,
    official: officialFigures ? (({ exactS: _, ...x }) => x)(officialFigures) : null,
    /** Segment speeds of the primary system along the course, for the chart. */
    segments: chartSystem?.segments.map(({ exactS: _, ...x }) => x) ?? [],
    readings: withReadings
      ? readings.map(g => ({
          id: g.id,
          trapId: g.trapId,
          systemId: g.systemId,
          time: formatTimeOfDay(g.ticks, ix.tpsOf.get(g.systemId)!),
        }))
      : [],
    crossChecks: c.crossChecks,
    wind: c.wind,
    weather: weather
      ? {
          windSpeedMs: weather.windSpeedMs,
          windFromDeg: weather.windFromDeg,
          temperatureC: weather.temperatureC,
          pressureHpa: weather.pressureHpa,
        }
      : null,
    findings: withSetAsides(c.findings, run.id, setAsides),
  }
}

/**
 * Findings of what the attempt rests on: the measured distance against its survey (shorter than
 * nominal, or longer beyond the tolerance) and its gradient under the attempt's profile; the rider's
 * licence on each day a counted run was made, in the event's zone.
 */
function settingFindings(ix: DayIndex, attempt: Attempt, { e, distance, course }: Setting, counted: ComputedRun[]) {
  const trap = (id: number) => ix.day.traps.find(t => t.id === id)!
  const survey = checkMeasuredDistance(
    attempt.profile,
    trap(distance.entryTrapId),
    trap(distance.exitTrapId),
    distance.nominalM,
    course.surveyToleranceMm,
  )
  const findings: Finding[] = [...survey.findings]
  const zone = ix.day.event.timeZone
  const late = [...new Set(counted.map(r => localDate(r.run.startedAt.getTime(), zone)))]
    .filter(d => d > e.rider.licenceExpires)
  if (late.length) {
    findings.push({
      code: 'rider.licence-expired',
      severity: 'fail',
      message: `The rider's licence ${e.rider.licenceNo} expired on ${e.rider.licenceExpires}, before the run(s) `
        + `of ${late.join(', ')}.`,
    })
  }
  return findings
}

/** The pair's figures, window and margin as the pages show them. */
function liveResult(ix: DayIndex, evaluation: AttemptResult | null, findings: Finding[], valid: boolean) {
  const { timeDecimals } = ix
  return {
    valid,
    result: evaluation?.result
      ? {
          kmh: evaluation.result.kmh,
          mph: evaluation.result.mph,
          meanTimeS: toFixed(evaluation.meanTimeS!, timeDecimals + 1),
        }
      : null,
    window: evaluation
      ? {
          ok: evaluation.window.ok,
          rule: evaluation.window.rule,
          deadline: iso(evaluation.window.deadlineMs),
          opens: iso(evaluation.window.opensMs),
        }
      : null,
    beatsRecord: evaluation?.meetsImprovement == null ? null : evaluation.meetsImprovement && valid,
    required: evaluation?.required ? { figure: evaluation.required.text, unit: evaluation.required.unit } : null,
    impoundDeadline: iso(evaluation?.impoundDeadlineMs ?? null),
    returnTargetS: evaluation?.runs.length === 1 && evaluation.returnTargetS
      ? toFixed(evaluation.returnTargetS, timeDecimals)
      : null,
    findings,
  }
}

function liveAttempt(ix: DayIndex, attempt: Attempt, withReadings: boolean) {
  const setting = attemptSetting(ix, attempt)
  const { e, distance, record } = setting
  const runs = computeRuns(ix, attempt, setting)
  const counted = runs.filter(r => r.run.status !== 'aborted' && r.official)
  const pair = new Set(counted.slice(0, 2).map(x => x.run.id))
  const { profile } = attempt
  const evaluation = evaluateCounted(ix, attempt, setting, counted)
  const liveRuns = runs.map(r => liveRun(ix, setting, r, pair.has(r.run.id), withReadings))
  const findings = withSetAsides(
    [...(evaluation?.findings ?? []), ...(counted.length ? settingFindings(ix, attempt, setting, counted) : [])],
    null,
    setting.setAsides,
  )
  // Valid is one answer: no failing finding that stands, of the pair (directions, window), of what it
  // rests on (survey, licence) or of its counted runs (a cross-check, a tail wind, a reading out of order).
  const valid = !!evaluation
    && ![...findings, ...liveRuns.filter(r => r.counted).flatMap(r => r.findings)]
      .some(f => blocks(f) && !f.code.startsWith('record.'))
  return {
    id: attempt.id,
    entry: {
      id: e.entry.id,
      teamId: e.entry.teamId,
      teamName: e.teamName,
      machineName: e.machine.name,
      riderName: e.rider.name,
      className: e.entry.className,
      distanceLabel: distance.label,
      distanceM: distance.nominalM,
    },
    profile: { id: profile.id, version: profile.version, name: profile.name, decimals: profile.figures.value.decimals },
    standingRecord: record ? { speed: record.speed, unit: record.unit } : null,
    runs: liveRuns,
    ...liveResult(ix, evaluation, findings, valid),
    sheet: sheetState(ix.day, attempt.id),
    impoundCheckedInAt: ix.day.impounds.find(i => i.attemptId === attempt.id)?.checkedInAt.toISOString() ?? null,
  }
}

/** Computes every run and attempt of the event from its stored readings with the shared engine. */
export function computeLive(day: EventDay, options: { readings?: boolean } = {}) {
  const ix = indexDay(day)
  return day.attempts.map(attempt => liveAttempt(ix, attempt, !!options.readings))
}
