import { abs, cmp, div, fromDecimal, q, sub, toFixed, type Q } from './exact'
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

/** Speeds of one run: each segment between traps and each measured distance, per timing system. */
export function computeRun(input: {
  profile: RuleProfile
  direction: Direction
  headingDeg: number
  traps: TrapDef[]
  distances: DistanceDef[]
  systems: SystemDef[]
  readings: ReadingDef[]
  weather?: WeatherDef | null
}): RunComputation {
  const findings: RunSheetFinding[] = []
  const byPosition = [...input.traps].sort((a, b) => cmp(fromDecimal(a.positionM), fromDecimal(b.positionM)))
  const order = input.direction === 'out' ? byPosition : byPosition.reverse()
  const trapName = new Map(input.traps.map(t => [t.id, t.label]))
  const out: RunComputation = { systems: [], official: {}, crossChecks: [], wind: null, findings }

  for (const system of input.systems) {
    const tps = BigInt(system.ticksPerSecond)
    const timeDecimals = String(system.ticksPerSecond).length - 1
    const at = new Map(input.readings.filter(r => r.systemId === system.id).map(r => [r.trapId, BigInt(r.ticks)]))
    const passed = order.filter(t => at.has(t.id))
    const segments: RunComputation['systems'][number]['segments'] = []
    for (let i = 1; i < passed.length; i++) {
      const a = passed[i - 1]!
      const b = passed[i]!
      const dt = at.get(b.id)! - at.get(a.id)!
      if (dt <= 0n) {
        findings.push({
          code: 'reading.out-of-order',
          severity: 'fail',
          trapId: b.id,
          systemId: system.id,
          message: `${system.name}: the time at ${b.label} (${formatTimeOfDay(at.get(b.id)!, tps)}) is not after the `
            + `time at ${a.label} (${formatTimeOfDay(at.get(a.id)!, tps)}), the trap before it on this run.`,
        })
        continue
      }
      const lengthM = abs(sub(fromDecimal(b.positionM), fromDecimal(a.positionM)))
      const f = figure(input.profile, lengthM, q(dt, tps), timeDecimals)
      if (Number(f.kmh) > SANITY_MAX_KMH) {
        findings.push({
          code: 'reading.implausible-speed',
          severity: 'fail',
          trapId: b.id,
          systemId: system.id,
          message: `${system.name}: ${f.kmh} km/h from ${a.label} to ${b.label} is beyond ${SANITY_MAX_KMH} km/h; `
            + `check the times.`,
        })
      }
      const mid = (Number(a.positionM) + Number(b.positionM)) / 2
      segments.push({ fromTrapId: a.id, toTrapId: b.id, lengthM: toFixed(lengthM, 3), midpointM: mid, ...f })
    }
    const distances: RunComputation['systems'][number]['distances'] = []
    for (const d of input.distances) {
      const t1 = at.get(d.entryTrapId)
      const t2 = at.get(d.exitTrapId)
      if (t1 === undefined || t2 === undefined) continue
      const dt = input.direction === 'out' ? t2 - t1 : t1 - t2
      if (dt <= 0n) continue // reported above as out of order
      const f = figure(input.profile, fromDecimal(d.nominalM), q(dt, tps), timeDecimals)
      distances.push({ distanceId: d.id, label: d.label, ...f })
      const current = out.official[d.id]
      if (!current || system.role === 'primary') out.official[d.id] = { exactS: f.exactS, systemId: system.id }
    }
    out.systems.push({ systemId: system.id, role: system.role, segments, distances })
  }

  const primary = out.systems.find(s => s.role === 'primary')
  const backup = out.systems.find(s => s.role === 'backup')
  const backupSystem = input.systems.find(s => s.role === 'backup')
  const primarySystem = input.systems.find(s => s.role === 'primary')
  for (const d of input.distances) {
    const p = primary?.distances.find(x => x.distanceId === d.id)
    const b = backup?.distances.find(x => x.distanceId === d.id)
    if (p && b && primarySystem && backupSystem) {
      const tolerance = fromDecimal(primarySystem.toleranceS)
      const difference = abs(sub(p.exactS, b.exactS))
      const ok = cmp(difference, tolerance) <= 0
      out.crossChecks.push({
        distanceId: d.id,
        label: d.label,
        differenceS: toFixed(difference, 6, 'round'),
        toleranceS: toFixed(tolerance, 6, 'round'),
        ok,
      })
      if (!ok) {
        findings.push({
          code: 'timing.cross-check',
          severity: 'fail',
          distanceId: d.id,
          message: `${d.label}: primary ${p.timeS} s and backup ${b.timeS} s differ by `
            + `${toFixed(difference, 6, 'round')} s, more than the tolerance of ${toFixed(tolerance, 6, 'round')} s. `
            + `The timekeeper must resolve it in writing.`,
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
  }

  if (input.weather) {
    const headingDeg = input.direction === 'out' ? input.headingDeg : (input.headingDeg + 180) % 360
    const w = windComponents(Number(input.weather.windSpeedMs), Number(input.weather.windFromDeg), headingDeg)
    out.wind = { ...w, headingDeg }
    findings.push(...checkWind(input.profile, w))
  }
  for (const f of findings) {
    if (f.trapId && !f.message.includes(trapName.get(f.trapId) ?? '\u0000'))
      f.message += ` (${trapName.get(f.trapId)})`
  }
  return out
}
