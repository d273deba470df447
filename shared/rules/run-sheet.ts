import { abs, add, cmp, div, fromDecimal, q, sub, toFixed, type Q } from './exact'
import type { Finding } from './findings'
import { checkWind, windComponents, type WindComponents } from './checks'
import type { RuleProfile } from './profile'
import { formatTimeOfDay } from './timing'
import { convertSpeed } from './units'
import type { Direction, SystemRole } from '../constants'

/**
 * A plausibility bound on any segment speed, above every land speed record so far (1,227.985 km/h
 * in 1997, from memory). A segment faster than this is a mistyped time, not a record.
 */
export const SANITY_MAX_KMH = 1500

export interface TrapDef {
  id: number
  label: string
  positionM: string
  elevationM: string
}
export interface DistanceDef {
  id: number
  label: string
  nominalM: string
  entryTrapId: number
  exitTrapId: number
}
export interface SystemDef {
  id: number
  name: string
  role: SystemRole
  ticksPerSecond: number
  toleranceS: string
}
/** Only the current readings: corrections already applied. Ticks as a decimal string of an integer. */
export interface ReadingDef {
  id: number
  trapId: number
  systemId: number
  ticks: string
}
export interface WeatherDef {
  windSpeedMs: string
  windFromDeg: string
}

export interface RunSheetFinding extends Finding {
  trapId?: number
  systemId?: number
  distanceId?: number
}

export interface TimedFigure {
  timeS: string
  kmh: string
  mph: string
  exactS: Q
}

export interface RunComputation {
  systems: {
    systemId: number
    role: SystemRole
    segments: ({ fromTrapId: number, toTrapId: number, lengthM: string, midpointM: number } & TimedFigure)[]
    distances: ({ distanceId: number, label: string } & TimedFigure)[]
  }[]
  /** The time over each measured distance that counts: the primary's, else the backup's. */
  official: Record<number, { exactS: Q, systemId: number }>
  crossChecks: { distanceId: number, label: string, differenceS: string, toleranceS: string, ok: boolean }[]
  wind: (WindComponents & { headingDeg: number }) | null
  findings: RunSheetFinding[]
}

const figure = (profile: RuleProfile, lengthM: Q, timeS: Q, timeDecimals: number): TimedFigure => {
  const v = div(lengthM, timeS)
  const { decimals, rounding } = profile.figures.value
  return {
    timeS: toFixed(timeS, timeDecimals),
    kmh: toFixed(convertSpeed(v, 'm/s', 'km/h'), decimals, rounding),
    mph: toFixed(convertSpeed(v, 'm/s', 'mph'), decimals, rounding),
    exactS: timeS,
  }
}

export interface RunInput {
  profile: RuleProfile
  direction: Direction
  headingDeg: number
  traps: TrapDef[]
  distances: DistanceDef[]
  systems: SystemDef[]
  readings: ReadingDef[]
  weather?: WeatherDef | null
}
type SystemResult = RunComputation['systems'][number]

/** Every segment between consecutive traps one system timed, in the order of the run. */
function systemSegments(input: RunInput, system: SystemDef, order: TrapDef[], at: Map<number, bigint>) {
  const tps = BigInt(system.ticksPerSecond)
  const timeDecimals = String(system.ticksPerSecond).length - 1
  const passed = order.filter(t => at.has(t.id))
  const segments: SystemResult['segments'] = []
  const findings: RunSheetFinding[] = []
  for (let i = 1; i < passed.length; i++) {
    const a = passed[i - 1]!
    const b = passed[i]!
    const where = { trapId: b.id, systemId: system.id }
    const dt = at.get(b.id)! - at.get(a.id)!
    if (dt <= 0n) {
      const [ta, tb] = [formatTimeOfDay(at.get(a.id)!, tps), formatTimeOfDay(at.get(b.id)!, tps)]
      findings.push({
        code: 'reading.out-of-order',
        severity: 'fail',
        ...where,
        message: `${system.name}: the time at ${b.label} (${tb}) is not after the time at ${a.label} (${ta}), `
          + 'the trap before it on this run.',
      })
      continue
    }
    const lengthM = abs(sub(fromDecimal(b.positionM), fromDecimal(a.positionM)))
    const f = figure(input.profile, lengthM, q(dt, tps), timeDecimals)
    if (Number(f.kmh) > SANITY_MAX_KMH) {
      findings.push({
        code: 'reading.implausible-speed',
        severity: 'fail',
        ...where,
        message: `${system.name}: ${f.kmh} km/h from ${a.label} to ${b.label} is beyond ${SANITY_MAX_KMH} km/h; `
          + 'check the times.',
      })
    }
    const mid = (Number(a.positionM) + Number(b.positionM)) / 2
    segments.push({ fromTrapId: a.id, toTrapId: b.id, lengthM: toFixed(lengthM, 3), midpointM: mid, ...f })
  }
  findings.push(...accelerationFindings(system, segments, new Map(order.map(t => [t.id, t]))))
  return { segments, findings }
}

/**
 * The change of speed between two consecutive segments a machine can make: 2 g (19.6133 m/s²), gaining or losing.
 * Tyres on a dry lake or runway grip at about 1 g, and a machine in the measured distance is neither launching nor
 * braking (common practice, from memory): beyond it a time was mistyped or a channel swapped.
 */
export const MAX_SEGMENT_ACCELERATION_MS2 = 2 * 9.80665

/**
 * Speeds of consecutive segments that no machine could join: (v2² − v1²) ÷ (2 · distance between the segments'
 * midpoints) beyond the limit either way. Named by the three traps, with both speeds.
 */
function accelerationFindings(system: SystemDef, segments: SystemResult['segments'], byId: Map<number, TrapDef>) {
  const findings: RunSheetFinding[] = []
  for (let i = 1; i < segments.length; i++) {
    const [s1, s2] = [segments[i - 1]!, segments[i]!]
    if (s1.toTrapId !== s2.fromTrapId) continue // a trap missed between them: not consecutive
    const [v1, v2] = [Number(s1.kmh) / 3.6, Number(s2.kmh) / 3.6]
    const a = (v2 * v2 - v1 * v1) / (2 * Math.abs(s2.midpointM - s1.midpointM))
    if (Math.abs(a) <= MAX_SEGMENT_ACCELERATION_MS2) continue
    const [t1, t2, t3] = [s1.fromTrapId, s1.toTrapId, s2.toTrapId].map(id => byId.get(id)!.label)
    findings.push({
      code: 'reading.implausible-acceleration',
      severity: 'fail',
      trapId: s2.fromTrapId,
      systemId: system.id,
      message: `${system.name}: ${s1.kmh} km/h from ${t1} to ${t2}, then ${s2.kmh} km/h from ${t2} to ${t3}, `
        + `${a > 0 ? 'gaining' : 'losing'} speed at ${(Math.abs(a) / 9.80665).toFixed(1)} g, more than the 2 g a `
        + 'machine can in the measured distance: check the times and the channels.',
    })
  }
  return findings
}

/** The time and speed over each measured distance one system timed from its entry to its exit trap. */
function systemDistances(input: RunInput, system: SystemDef, at: Map<number, bigint>) {
  const tps = BigInt(system.ticksPerSecond)
  const timeDecimals = String(system.ticksPerSecond).length - 1
  const distances: SystemResult['distances'] = []
  for (const d of input.distances) {
    const t1 = at.get(d.entryTrapId)
    const t2 = at.get(d.exitTrapId)
    if (t1 === undefined || t2 === undefined) continue
    const dt = input.direction === 'out' ? t2 - t1 : t1 - t2
    if (dt <= 0n) continue // reported with the segments as out of order
    const f = figure(input.profile, fromDecimal(d.nominalM), q(dt, tps), timeDecimals)
    distances.push({ distanceId: d.id, label: d.label, ...f })
  }
  return distances
}

/**
 * Primary against backup over each distance both timed: they agree within the two systems' stated
 * tolerances added together (each may be off by its own; common practice of comparing two instruments).
 */
function crossCheck(input: RunInput, results: SystemResult[]) {
  const primarySystem = input.systems.find(s => s.role === 'primary')
  const backupSystem = input.systems.find(s => s.role === 'backup')
  const primary = results.find(s => s.role === 'primary')
  const backup = results.find(s => s.role === 'backup')
  const crossChecks: RunComputation['crossChecks'] = []
  const findings: RunSheetFinding[] = []
  for (const d of input.distances) {
    const p = primary?.distances.find(x => x.distanceId === d.id)
    const b = backup?.distances.find(x => x.distanceId === d.id)
    if (p && b && primarySystem && backupSystem) {
      const tolerance = add(fromDecimal(primarySystem.toleranceS), fromDecimal(backupSystem.toleranceS))
      const difference = abs(sub(p.exactS, b.exactS))
      const ok = cmp(difference, tolerance) <= 0
      const [differenceS, toleranceS] = [toFixed(difference, 6, 'round'), toFixed(tolerance, 6, 'round')]
      crossChecks.push({ distanceId: d.id, label: d.label, differenceS, toleranceS, ok })
      if (!ok) {
        findings.push({
          code: 'timing.cross-check',
          severity: 'fail',
          distanceId: d.id,
          message: `${d.label}: primary ${p.timeS} s and backup ${b.timeS} s differ by ${differenceS} s, more than `
            + `the tolerance of ${toleranceS} s. The timekeeper must resolve it in writing.`,
        })
      }
    }
    else if (!p && b) {
      findings.push({
        code: 'timing.backup-only',
        severity: 'warn',
        distanceId: d.id,
        message: `${d.label}: only the backup system timed this distance.`,
      })
    }
    if (!!p !== !!b && primarySystem && backupSystem) {
      const [timed, missing] = p ? [primarySystem, backupSystem] : [backupSystem, primarySystem]
      findings.push({
        code: 'timing.single-system',
        severity: 'fail',
        distanceId: d.id,
        message: `${d.label}: timed by the ${timed.role} system (${timed.name}) only; the ${missing.role} system `
          + `(${missing.name}) has no time over it. The chief timekeeper must write why.`,
      })
    }
  }
  return { crossChecks, findings }
}

/** The time over each measured distance that counts: the primary's, else the backup's. */
function officialTimes(results: SystemResult[]) {
  const official: RunComputation['official'] = {}
  for (const r of results) {
    for (const d of r.distances) {
      const taken = official[d.distanceId]
      if (!taken || r.role === 'primary') official[d.distanceId] = { exactS: d.exactS, systemId: r.systemId }
    }
  }
  return official
}

/** Head and cross wind along the run's direction, and the profile's wind limit. */
function runWind(input: RunInput) {
  if (!input.weather) return { wind: null, findings: [] }
  const headingDeg = input.direction === 'out' ? input.headingDeg : (input.headingDeg + 180) % 360
  const w = windComponents(Number(input.weather.windSpeedMs), Number(input.weather.windFromDeg), headingDeg)
  return { wind: { ...w, headingDeg }, findings: checkWind(input.profile, w) }
}

const HALF_DAY_S = 43_200n

/**
 * A run's times of day in its order of traps, carried over midnight: a trap read more than 12 h "earlier"
 * than the trap before it was passed after midnight (a run lasts minutes), so a day is added to it.
 */
export function acrossMidnight(order: TrapDef[], at: Map<number, bigint>, ticksPerSecond: number) {
  const half = HALF_DAY_S * BigInt(ticksPerSecond)
  const carried = new Map(at)
  let before: bigint | undefined
  let offset = 0n
  for (const t of order) {
    const read = at.get(t.id)
    if (read === undefined) continue
    if (before !== undefined && read + offset < before - half) offset += 2n * half
    before = read + offset
    carried.set(t.id, before)
  }
  return carried
}

/** Speeds of one run: each segment between traps and each measured distance, per timing system. */
export function computeRun(input: RunInput): RunComputation {
  const byPosition = [...input.traps].sort((a, b) => cmp(fromDecimal(a.positionM), fromDecimal(b.positionM)))
  const order = input.direction === 'out' ? byPosition : byPosition.reverse()
  const findings: RunSheetFinding[] = []
  const systems = input.systems.map((system) => {
    const read = new Map(input.readings.filter(r => r.systemId === system.id).map(r => [r.trapId, BigInt(r.ticks)]))
    const at = acrossMidnight(order, read, system.ticksPerSecond)
    const { segments, findings: segmentFindings } = systemSegments(input, system, order, at)
    findings.push(...segmentFindings)
    return { systemId: system.id, role: system.role, segments, distances: systemDistances(input, system, at) }
  })
  const checks = crossCheck(input, systems)
  const { wind, findings: windFindings } = runWind(input)
  findings.push(...checks.findings, ...windFindings)
  const trapName = new Map(input.traps.map(t => [t.id, t.label]))
  for (const f of findings) {
    if (f.trapId && !f.message.includes(trapName.get(f.trapId) ?? '\u0000')) f.message += ` (${trapName.get(f.trapId)})`
  }
  return { systems, official: officialTimes(systems), crossChecks: checks.crossChecks, wind, findings }
}
