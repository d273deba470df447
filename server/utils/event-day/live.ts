import { evaluateAttempt, type AttemptResult } from '#shared/rules/attempt'
import { cmp, fromDecimal, toFixed } from '#shared/rules/exact'
import { computeRun } from '#shared/rules/run-sheet'
import { runCountsFor } from '#shared/rules/distances'
import { classesOf, classProblems, findClass, type Division } from '#shared/rules/classes'
import { formatTimeOfDay } from '#shared/rules/timing'
import { checkMeasuredDistance } from '#shared/rules/course'
import { blocks, setAsideQuorum, withSetAsides, type Finding } from '#shared/rules/findings'
import { stewardsQuorum } from '#shared/rules/profile'
import { consequencesOn } from '#shared/rules/protests'
import { publishedInMs } from '#shared/rules/units'
import { localDate, nearestTimeOfDay } from '#shared/rules/zoned'
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
    /** The zone each system's times of day are read in: UTC for one set to it, else the event's. */
    zoneOf: new Map(day.systems.map(s => [s.id, s.timeBase === 'utc' ? 'UTC' : day.event.timeZone])),
    tpsOf: new Map(day.systems.map(s => [s.id, BigInt(s.ticksPerSecond)])),
    timeDecimals: Math.max(3, ...day.systems.map(s => String(s.ticksPerSecond).length - 1)),
  }
}
type DayIndex = ReturnType<typeof indexDay>
type Attempt = EventDay['attempts'][number]

/**
 * The record an attempt is measured against: the fastest for its class and distance that stood when
 * its first run started (a result ratified later does not count against it; one entered by hand always
 * stands). A class with no record is vacant: the organiser's minimum for it, if one is set, stands instead.
 */
function recordStandingAt(ix: DayIndex, attempt: Attempt, className: string, distanceLabel: string) {
  const firstRun = ix.day.runs.find(r => r.attemptId === attempt.id)
  const from = firstRun?.startedAt.getTime() ?? Number.POSITIVE_INFINITY
  const standing = ix.day.records
    .filter(r => r.className === className && r.distanceLabel === distanceLabel)
    // A record set by this attempt's own ratification is never held against it.
    .filter(r => !r.setAt || (r.setAt.getTime() <= from && r.fromAttemptId !== attempt.id))
  const records = standing.filter(r => !r.minimum)
  return (records.length ? records : standing).reduce<typeof ix.day.records[number] | undefined>(
    (best, r) => (!best || cmp(publishedInMs(r), publishedInMs(best)) > 0 ? r : best),
    undefined,
  )
}

/**
 * What an attempt is about: its entry, the distances it claims (the first first), their course and the
 * officials' set-asides.
 */
function attemptSetting(ix: DayIndex, attempt: Attempt) {
  const e = ix.entryById.get(attempt.entryId)!
  const claims = e.entry.distanceIds.map(id => ix.distanceById.get(id)).filter(d => d !== undefined)
  const course = ix.courseById.get(claims[0]!.courseId)!
  // A set-aside counts once the profile's quorum of stewards has signed it (the chief timekeeper alone, for a gap in
  // the timing evidence); it is then theirs, by every name.
  const quorum = stewardsQuorum(attempt.profile)
  const setAsides = ix.day.setAsides
    .filter(s => s.attemptId === attempt.id && s.signers.length >= setAsideQuorum(s.code, quorum))
    .map(s => ({ ...s, by: s.signers.join(' and '), at: s.createdAt.toISOString() }))
  return { e, claims, course, setAsides }
}
type Setting = ReturnType<typeof attemptSetting>
type Distance = Setting['claims'][number]

/** One claimed distance of the attempt, with the record it is measured against. */
function distanceSetting(ix: DayIndex, attempt: Attempt, setting: Setting, distance: Distance) {
  return { ...setting, distance, record: recordStandingAt(ix, attempt, setting.e.entry.className, distance.label) }
}
type DistanceSetting = ReturnType<typeof distanceSetting>

/** Each run of the attempt through the run-sheet engine: every distance of the course, every system. */
function computeRuns(ix: DayIndex, attempt: Attempt, { course }: Setting) {
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
    return { run, c, readings, weather }
  })
}

/**
 * The runs as one distance sees them, with their official time over it: a run of the other start kind
 * (a flying pass for a standing-start distance, or the reverse) has none.
 */
function runsFor(computed: ReturnType<typeof computeRuns>, distance: Distance) {
  return computed.map(r => ({
    ...r,
    official: runCountsFor(distance.start, r.run.start) ? r.c.official[distance.id] : undefined,
  }))
}
type ComputedRun = ReturnType<typeof runsFor>[number]

/**
 * The instant a run left the measured distance: the time of day at its last trap (the exit trap out, the entry
 * trap back) on the system whose time counts, placed at the instant nearest the run's start at which that system's
 * clock (the event's local time, or UTC) showed it (after midnight, or in the hour repeated when the clocks go back,
 * the run's own).
 */
function leftDistanceAt(ix: DayIndex, r: ComputedRun, distance: Distance, systemId: number) {
  const lastTrap = r.run.direction === 'out' ? distance.exitTrapId : distance.entryTrapId
  const reading = r.readings.find(g => g.trapId === lastTrap && g.systemId === systemId)
  if (!reading) return undefined
  const ofDay = Number(reading.ticks * 1000n / ix.tpsOf.get(reading.systemId)!)
  return nearestTimeOfDay(ofDay, r.run.startedAt.getTime(), ix.zoneOf.get(reading.systemId)!) ?? undefined
}

/**
 * The instant a pass finished: the last measured distance it left, of every distance the attempt claims on it (the
 * mile's exit after the kilometre's inside it), so that one pass has one finish and every distance claimed from the
 * same passes is held to the same window.
 */
function passFinishedAt(ix: DayIndex, r: ComputedRun, claims: Distance[]) {
  const left = claims.flatMap((d) => {
    const official = runCountsFor(d.start, r.run.start) ? r.c.official[d.id] : undefined
    const at = official ? leftDistanceAt(ix, r, d, official.systemId) : undefined
    return at === undefined ? [] : [at]
  })
  return left.length ? Math.max(...left) : undefined
}

/** Where the profile has a qualifying run: the impound check-in after it, null if none is recorded. */
function impoundCheckIn(ix: DayIndex, attempt: Attempt) {
  if (!attempt.profile.qualifying?.value) return undefined
  return ix.day.impounds.find(i => i.attemptId === attempt.id)?.checkedInAt.getTime() ?? null
}

/** The pair by the profile, from the first two runs that finished with an official time. */
function evaluateCounted(
  ix: DayIndex,
  attempt: Attempt,
  { distance, record, claims }: DistanceSetting,
  counted: ComputedRun[],
) {
  if (!counted.length) return null
  return evaluateAttempt({
    profile: attempt.profile,
    distanceM: fromDecimal(distance.nominalM),
    runs: counted.slice(0, 2).map(r => ({
      direction: r.run.direction,
      startedAtMs: r.run.startedAt.getTime(),
      elapsedS: r.official!.exactS,
      finishedAtMs: passFinishedAt(ix, r, claims),
    })),
    // Compared in the unit the record was published in, at its exact decimal.
    record: record ? { value: fromDecimal(record.speed), unit: record.unit, minimum: record.minimum } : undefined,
    timeZone: ix.day.event.timeZone,
    timeDecimals: ix.timeDecimals,
    impoundCheckInMs: impoundCheckIn(ix, attempt),
  })
}

/** One run as the pages show it. */
function liveRun(
  ix: DayIndex,
  { distance, setAsides }: DistanceSetting,
  r: ComputedRun,
  counted: boolean,
  withReadings: boolean,
) {
  const { run, c, official, readings, weather } = r
  const officialFigures = official
    ? c.systems.find(s => s.systemId === official.systemId)!.distances.find(d => d.distanceId === distance.id)!
    : null
  const chartSystem = c.systems.find(s => s.role === 'primary') ?? c.systems[0]
  // A finding about another measured distance (its cross-check) belongs to that distance's result.
  const own = c.findings.filter(f => !f.distanceId || f.distanceId === distance.id)
  return {
    id: run.id,
    direction: run.direction,
    start: run.start,
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
    // Every distance of the course, as the timekeeper resolves them; the findings are the distance's own.
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
    findings: withSetAsides(own, run.id, setAsides),
  }
}

/**
 * Findings of what the attempt rests on: the measured distance against its survey (shorter than
 * nominal, or longer beyond the tolerance) and its gradient under the attempt's profile; the rider's
 * licence on each day a counted run was made, in the event's zone.
 */
function settingFindings(
  ix: DayIndex,
  attempt: Attempt,
  { e, distance, course }: DistanceSetting,
  counted: ComputedRun[],
) {
  const trap = (id: number) => ix.day.traps.find(t => t.id === id)!
  const survey = checkMeasuredDistance(
    attempt.profile,
    trap(distance.entryTrapId),
    trap(distance.exitTrapId),
    distance.nominalM,
    course.surveyToleranceMm,
  )
  const findings: Finding[] = [...survey.findings, ...classFindings(ix, attempt, e, counted)]
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
  // Where the profile requires a medical, one valid on the day of each counted run: a start the clerk of the course
  // allowed without one stays a finding in the file (the override lets a run start; it does not make it count).
  if (attempt.profile.licence?.value.medical) {
    const medical = e.rider.medicalExpires
    const without = [...new Set(counted.map(r => localDate(r.run.startedAt.getTime(), zone)))]
      .filter(d => !medical || d > medical)
    if (without.length) {
      findings.push({
        code: 'rider.medical',
        severity: 'fail',
        message: medical
          ? `The rider's medical expired on ${medical}, before the run(s) of ${without.join(', ')}.`
          : 'No medical is recorded for the rider, which the profile requires, for the run(s) of '
            + `${without.join(', ')}.`,
      })
    }
  }
  return findings
}

/**
 * The machine against the class its entry claims, as measured at the inspection in force when the first
 * counted run started (the latest signed before it, else its first): propulsion as entered, division as the
 * scrutineer saw it, mass and capacity as measured, figures side by side. A profile with no class list asks nothing.
 */
function classFindings(ix: DayIndex, attempt: Attempt, e: Setting['e'], counted: ComputedRun[]): Finding[] {
  const c = findClass(classesOf(attempt.profile), e.entry.className)
  if (!c) return []
  const at = counted[0]!.run.startedAt.getTime()
  const machine = ix.day.inspected.filter(i => i.machineId === e.machine.id)
  // The inspection in force then; for a run typed in before any inspection (which the inspection item of
  // readiness refuses on its own), the machine's first inspection still says what it measures.
  const inForce = (machine.filter(i => i.signedAt.getTime() <= at).at(-1) ?? machine[0])?.inspectionId
  const figures = inspectedFigures(ix.day, inForce ?? null)
  const problems = classProblems(c, {
    ...figures,
    power: e.machine.power,
    // The division the scrutineer saw; the entry's on an inspection from before divisions were confirmed.
    division: figures.division ?? (e.machine.division as Division | null) ?? null,
  })
  if (!problems.length) return []
  return [{
    code: 'class.outside',
    severity: 'fail',
    message: `The machine is outside its class ${c.label}${inForce ? ` (inspection #${inForce})` : ''}: `
      + `${problems.join('; ')}.`,
    rule: { name: 'Class', value: c.label, source: attempt.profile.classes!.source, certainty: c.certainty },
  }]
}

/**
 * What the stewards' decisions on protests make void on the attempt (the decision that stands: the appeal's where it
 * changed the protest's): the result, or a run. A condition of the record: nobody sets it aside.
 */
function protestFindings(ix: DayIndex, attempt: Attempt): Finding[] {
  return consequencesOn(ix.day.protests, attempt.id).map((c) => {
    const by = c.decidedBy === c.protestId
      ? `protest #${c.protestId}`
      : `appeal #${c.decidedBy} on protest #${c.protestId}`
    return c.voids === 'result'
      ? { code: 'protest.result-void', severity: 'fail' as const,
          message: `The stewards upheld ${by}: the attempt's result is void.` }
      : { code: 'protest.run-void', severity: 'fail' as const,
          message: `The stewards upheld ${by}: run #${c.runId} is void: no pair with it is valid.` }
  })
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
    leaveBy: evaluation?.leaveBy ? { ...evaluation.leaveBy, at: iso(evaluation.leaveBy.atMs)! } : null,
    findings,
  }
}

/** The result of one claimed distance from the attempt's runs: its pair, window, record and findings. */
function liveDistance(
  ix: DayIndex,
  attempt: Attempt,
  setting: DistanceSetting,
  computed: ReturnType<typeof computeRuns>,
  withReadings: boolean,
) {
  const { e, distance, record } = setting
  const runs = runsFor(computed, distance)
  const counted = runs.filter(r => r.run.status !== 'aborted' && r.official)
  const pair = new Set(counted.slice(0, 2).map(x => x.run.id))
  const evaluation = evaluateCounted(ix, attempt, setting, counted)
  const liveRuns = runs.map(r => liveRun(ix, setting, r, pair.has(r.run.id), withReadings))
  const findings = withSetAsides(
    [...(evaluation?.findings ?? []),
      ...(counted.length ? [...settingFindings(ix, attempt, setting, counted), ...protestFindings(ix, attempt)] : [])],
    null,
    setting.setAsides,
  )
  // Valid is one answer: no failing finding that stands, of the pair (directions, window), of what it
  // rests on (survey, licence) or of its counted runs (a cross-check, a tail wind, a reading out of order).
  const valid = !!evaluation
    && ![...findings, ...liveRuns.filter(r => r.counted).flatMap(r => r.findings)]
      .some(f => blocks(f) && !f.code.startsWith('record.'))
  return {
    entry: {
      id: e.entry.id,
      teamId: e.entry.teamId,
      teamName: e.teamName,
      machineName: e.machine.name,
      riderName: e.rider.name,
      className: e.entry.className,
      distanceId: distance.id,
      distanceLabel: distance.label,
      distanceM: distance.nominalM,
      distanceStart: distance.start,
    },
    standingRecord: record ? { speed: record.speed, unit: record.unit, minimum: record.minimum } : null,
    runs: liveRuns,
    ...liveResult(ix, evaluation, findings, valid),
  }
}

/**
 * An attempt as the pages show it: the result of the distance asked for (else the first it claims) at
 * the top, and the result of every claimed distance in `distances`, all from the same readings.
 */
function liveAttempt(ix: DayIndex, attempt: Attempt, withReadings: boolean, distanceId?: number) {
  const setting = attemptSetting(ix, attempt)
  const computed = computeRuns(ix, attempt, setting)
  const results = setting.claims.map(d => liveDistance(
    ix, attempt, distanceSetting(ix, attempt, setting, d), computed, withReadings,
  ))
  const shown = results.find(r => r.entry.distanceId === distanceId) ?? results[0]!
  const { profile } = attempt
  return {
    id: attempt.id,
    ...shown,
    profile: { id: profile.id, version: profile.version, name: profile.name, decimals: profile.figures.value.decimals },
    distances: results.map(({ entry, runs, findings: _, ...r }) => ({
      distanceId: entry.distanceId,
      label: entry.distanceLabel,
      nominalM: entry.distanceM,
      start: entry.distanceStart,
      countedRunIds: runs.filter(x => x.counted).map(x => x.id),
      ...r,
    })),
    timeZone: ix.day.event.timeZone,
    sheet: sheetState(ix.day, attempt.id),
    impoundCheckedInAt: ix.day.impounds.find(i => i.attemptId === attempt.id)?.checkedInAt.toISOString() ?? null,
  }
}

/**
 * Computes every run and attempt of the event from its stored readings with the shared engine; with
 * `distanceId`, an attempt claiming that distance shows its result at the top.
 */
export function computeLive(day: EventDay, options: { readings?: boolean, distanceId?: number } = {}) {
  const ix = indexDay(day)
  return day.attempts.map(attempt => liveAttempt(ix, attempt, !!options.readings, options.distanceId))
}
