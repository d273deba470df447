import { evaluateAttempt } from '#shared/rules/attempt'
import { fromDecimal, toFixed } from '#shared/rules/exact'
import { computeRun } from '#shared/rules/run-sheet'
import { formatTimeOfDay } from '#shared/rules/timing'
import type { EventDay } from './load'

const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString())

/** The state of each attempt's timing sheet from its signature chain. */
export function sheetState(day: EventDay, attemptId: number) {
  const chain = day.signatures.filter(x => x.s.subjectId === attemptId && x.s.kind.startsWith('timing-sheet'))
  const latest = chain.at(-1)
  return {
    locked: latest?.s.kind === 'timing-sheet',
    latest: latest
      ? {
          id: latest.s.id,
          kind: latest.s.kind,
          by: latest.signerName,
          typedName: latest.s.typedName,
          at: latest.s.signedAt,
          sha256: latest.s.contentSha256,
          reason: latest.s.reason,
        }
      : null,
    history: chain.map(x => ({
      id: x.s.id,
      kind: x.s.kind,
      by: x.signerName,
      typedName: x.s.typedName,
      at: x.s.signedAt,
      sha256: x.s.contentSha256,
      reason: x.s.reason,
    })),
  }
}

/** Computes every run and attempt of the event from its stored readings with the shared engine. */
export function computeLive(day: EventDay, options: { readings?: boolean } = {}) {
  const entryById = new Map(day.entries.map(e => [e.entry.id, e]))
  const distanceById = new Map(day.distances.map(d => [d.id, d]))
  const courseById = new Map(day.courses.map(c => [c.id, c]))
  const weatherByRun = new Map(day.weather.map(w => [w.runId, w]))
  const readingsByRun = new Map<number, EventDay['readings']>()
  for (const r of day.readings)
    if (r.current) readingsByRun.set(r.runId, [...(readingsByRun.get(r.runId) ?? []), r])
  const systems = day.systems.map(s => ({
    id: s.id,
    name: s.name,
    role: s.role,
    ticksPerSecond: s.ticksPerSecond,
    toleranceS: s.toleranceS,
  }))
  const tpsOf = new Map(day.systems.map(s => [s.id, BigInt(s.ticksPerSecond)]))
  const timeDecimals = Math.max(3, ...day.systems.map(s => String(s.ticksPerSecond).length - 1))

  return day.attempts.map((attempt) => {
    const e = entryById.get(attempt.entryId)!
    const distance = distanceById.get(e.entry.distanceId)!
    const course = courseById.get(distance.courseId)!
    const traps = day.traps.filter(t => t.courseId === course.id)
    const distances = day.distances.filter(d => d.courseId === course.id)
    const record = day.records.find(r => r.className === e.entry.className && r.distanceLabel === distance.label)
    const profile = attempt.profile
    const runs = day.runs
      .filter(r => r.attemptId === attempt.id)
      .map((run) => {
        const readings = readingsByRun.get(run.id) ?? []
        const weather = weatherByRun.get(run.id)
        const c = computeRun({
          profile,
          direction: run.direction,
          headingDeg: Number(course.headingDeg),
          traps,
          distances,
          systems,
          readings: readings.map(r => ({
            id: r.id,
            trapId: r.trapId,
            systemId: r.systemId,
            ticks: r.ticks.toString(),
          })),
          weather: weather ?? null,
        })
        const official = c.official[distance.id]
        return { run, c, official, readings, weather }
      })

    const counted = runs.filter(r => r.run.status !== 'aborted' && r.official)
    const evaluation = counted.length
      ? evaluateAttempt({
          profile,
          distanceM: fromDecimal(distance.nominalM),
          runs: counted
            .slice(0, 2)
            .map(r => ({
              direction: r.run.direction,
              startedAtMs: r.run.startedAt.getTime(),
              elapsedS: r.official!.exactS,
            })),
          record: record ? { value: fromDecimal(record.speedKmh), unit: 'km/h' } : undefined,
          timeZone: day.event.timeZone,
          timeDecimals,
        })
      : null

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
      profile: {
        id: profile.id,
        version: profile.version,
        name: profile.name,
        decimals: profile.figures.value.decimals,
      },
      standingRecordKmh: record?.speedKmh ?? null,
      runs: runs
        .map(({ run, c, official, readings, weather }) => ({
          id: run.id,
          direction: run.direction,
          startedAt: run.startedAt.toISOString(),
          status: run.status,
          abortedReason: run.abortedReason,
          counted: counted.slice(0, 2).some(x => x.run.id === run.id),
          official: official
            ? c.systems
              .find(s => s.systemId === official.systemId)!
              .distances.find(d => d.distanceId === distance.id)!
            : null,
          /** Segment speeds of the primary system along the course, for the chart. */
          segments:
            (c.systems.find(s => s.role === 'primary') ?? c.systems[0])?.segments.map(({ exactS: _, ...x }) => x)
            ?? [],
          readings: options.readings
            ? readings.map(r => ({
                id: r.id,
                trapId: r.trapId,
                systemId: r.systemId,
                time: formatTimeOfDay(r.ticks, tpsOf.get(r.systemId)!),
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
          findings: c.findings,
        }))
        .map(r => ({ ...r, official: r.official ? (({ exactS: _, ...x }) => x)(r.official) : null })),
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
      beatsRecord: evaluation?.beatsRecord ?? null,
      required: evaluation?.required ? { figure: evaluation.required.text, unit: evaluation.required.unit } : null,
      returnTargetS:
        counted.length === 1 && evaluation?.returnTargetS ? toFixed(evaluation.returnTargetS, timeDecimals) : null,
      findings: evaluation?.findings ?? [],
      sheet: sheetState(day, attempt.id),
    }
  })
}
