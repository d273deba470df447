// The attempt planner: the machine's speed along a course in the day's air, the time over the measured distance
// each way, the two-way result by the profile, the record it must beat, the power or drag that would beat it by
// the profile's margin (solved), the return-run budget and the sensitivity to power, drag and weather.
import { windComponents } from '../checks'
import { toNumber } from '../exact'
import { MS_PER_KMH, MS_PER_MPH } from '../units'
import { airDensity, standardAtmosphere } from './atmosphere'
import { closedFormTopSpeed, topSpeed, type Machine } from './road-load'
import { integrateRun, STEP_M } from './run'
import type { RuleProfile } from '../profile'

/** Road speed in km/h and mph from m/s, by the project's exact factors (1 km/h = 5/18 m/s, 1 mph = 0.44704 m/s). */
const MS_KMH = toNumber(MS_PER_KMH)
const MS_MPH = toNumber(MS_PER_MPH)
export const kmhOf = (ms: number) => ms / MS_KMH
export const mphOf = (ms: number) => ms / MS_MPH

export interface PlanInput {
  machine: Machine
  conditions: {
    altitudeM: number
    /** The day's air temperature, °C; the standard atmosphere's at the altitude when not given. */
    temperatureC: number | null
    /** The day's station pressure, hPa; the standard atmosphere's at the altitude when not given. */
    pressureHpa: number | null
    windMs: number
    windFromDeg: number
  }
  course: {
    label: string
    /** Start line to the end of the usable course, m. */
    lengthM: number
    /** Heading of the out run, degrees. */
    headingDeg: number
    /** Entry and exit traps of the measured distance, m from the out run's start line. */
    entryM: number
    exitM: number
    /** Other measured distances timed on the same passes (a kilometre inside the mile), m from the start line. */
    others?: { label: string, entryM: number, exitM: number }[]
  }
  /** Deceleration after the exit trap (parachute, brakes), m/s², and the run-off the organiser keeps clear, m. */
  shutdown: { decelerationMs2: number, marginM: number }
  profile: Pick<RuleProfile, 'averaging' | 'margin' | 'window'>
  /** The standing record for the class and distance, km/h; null for none. */
  recordKmh: number | null
  /** From stopping at the end of a run to leaving the line again, minutes. */
  turnaroundMin: number
}

/**
 * How far a station pressure may stand from the standard atmosphere's at the altitude before the planner asks
 * whether it is one, hPa: weather moves a station's pressure by some tens of hPa (common practice), while a
 * sea-level pressure (as weather reports give it) typed instead is off by about 12 hPa per 100 m of altitude.
 */
export const PRESSURE_CHECK_HPA = 60

/** A typed pressure far from the standard atmosphere's at the altitude: likely the sea-level one, not the station's. */
export function pressureFinding(altitudeM: number, pressureHpa: number | null): PlanFinding | null {
  if (pressureHpa === null) return null
  const isaHpa = standardAtmosphere(altitudeM).pressurePa / 100
  const off = pressureHpa - isaHpa
  if (Math.abs(off) <= PRESSURE_CHECK_HPA) return null
  return {
    code: 'air.pressure-check',
    message: `${fmt(pressureHpa, 1)} hPa is ${fmt(Math.abs(off), 0)} hPa ${off > 0 ? 'above' : 'below'} the standard `
      + `atmosphere's ${fmt(isaHpa, 1)} hPa at ${fmt(altitudeM, 0)} m, more than the ${PRESSURE_CHECK_HPA} hPa weather `
      + 'moves it: give the station pressure (as a barometer at the course reads), not the sea-level pressure of a '
      + 'weather report',
  }
}

export interface PlanFinding {
  code: 'runup.short' | 'shutdown.overrun' | 'record.short' | 'window.short' | 'record.none' | 'air.pressure-check'
  message: string
}

/** A machine at top speed still gains under 2 % here: the run-up is long enough (a planner setting). */
export const RUNUP_SHARE = 0.98

const fmt = (x: number, d = 1) => x.toFixed(d)

export function densityOf(c: PlanInput['conditions']) {
  const isa = standardAtmosphere(c.altitudeM)
  const temperatureC = c.temperatureC ?? isa.temperatureK - 273.15
  const pressureHpa = c.pressureHpa ?? isa.pressurePa / 100
  return { rho: airDensity(pressureHpa, temperatureC), temperatureC, pressureHpa, isaDensity: isa.density }
}

/**
 * One direction: where the traps lie from its own start line, its wind, and what the run gives over the main
 * measured distance and each other one timed on the same pass. Power stays on to the last exit trap.
 */
function direction(x: PlanInput, rho: number, dir: 'out' | 'back') {
  const c = x.course
  const mirror = (s: { label: string, entryM: number, exitM: number }) => (dir === 'out'
    ? s
    : { label: s.label, entryM: c.lengthM - s.exitM, exitM: c.lengthM - s.entryM })
  const spans = [{ label: c.label, entryM: c.entryM, exitM: c.exitM }, ...(c.others ?? [])].map(mirror)
  const main = spans[0]!
  const powerOffAtM = Math.max(...spans.map(s => s.exitM))
  const heading = dir === 'out' ? c.headingDeg : (c.headingDeg + 180) % 360
  const headWindMs = windComponents(x.conditions.windMs, x.conditions.windFromDeg, heading).headMs
  const run = integrateRun({
    machine: x.machine, rho, headWindMs, powerOffAtM, marks: spans.flatMap(s => [s.entryM, s.exitM]),
    sampleEveryM: Math.max(STEP_M, Math.round(c.lengthM / 200)),
  })
  const at = (m: number) => run.at.find(p => Math.abs(p.m - m) < 1e-9)!
  const over = spans.map((s) => {
    const [a, b] = [at(s.entryM), at(s.exitM)]
    return { label: s.label, entryM: s.entryM, exitM: s.exitM, entryMs: a.vMs, exitMs: b.vMs, timeS: b.tS - a.tS,
      speedMs: (s.exitM - s.entryM) / (b.tS - a.tS), exitTS: b.tS }
  })
  const m = over[0]!
  const stopM = powerOffAtM + (run.offVMs * run.offVMs) / (2 * x.shutdown.decelerationMs2)
  const top = topSpeed(x.machine, rho, headWindMs)
  // Shut-down: constant deceleration from the last exit trap to rest, sampled for the chart.
  const shutdown = [] as { m: number, vMs: number }[]
  for (let f = 0.1; f <= 1.0001; f += 0.1) {
    shutdown.push({ m: powerOffAtM + f * (stopM - powerOffAtM), vMs: run.offVMs * Math.sqrt(Math.max(1 - f, 0)) })
  }
  return {
    direction: dir, headWindMs, entryM: main.entryM, exitM: main.exitM, topMs: top,
    entryMs: m.entryMs, exitMs: m.exitMs, timeS: m.timeS, speedMs: m.speedMs,
    /** From the start line to the main distance's exit trap (the run's finish), and to power off. */
    runTimeS: m.exitTS, offTimeS: run.offTS, offMs: run.offVMs,
    shutdownS: run.offVMs / x.shutdown.decelerationMs2,
    stopM, overrunM: stopM + x.shutdown.marginM - c.lengthM,
    distances: over.map(o => ({ label: o.label, entryKmh: kmhOf(o.entryMs), exitKmh: kmhOf(o.exitMs), timeS: o.timeS,
      speedKmh: kmhOf(o.speedMs) })),
    samples: [...run.samples, ...shutdown],
  }
}
export type DirectionPlan = ReturnType<typeof direction>

/** The two-way result, m/s, by the profile: the distance over the mean of the times, or the mean of the speeds. */
function twoWay(x: PlanInput, out: DirectionPlan, back: DirectionPlan) {
  const d = x.course.exitM - x.course.entryM
  return x.profile.averaging.value === 'mean-of-times'
    ? d / ((out.timeS + back.timeS) / 2)
    : (out.speedMs + back.speedMs) / 2
}

/** Both runs and their result for a machine in the given air (the unit of every solve and sensitivity row). */
export function bothWays(x: PlanInput, rho = densityOf(x.conditions).rho) {
  const out = direction(x, rho, 'out')
  const back = direction(x, rho, 'back')
  return { out, back, resultMs: twoWay(x, out, back) }
}

/** The speed a claim must reach: the standing record raised by the profile's margin. */
export function requiredKmh(x: PlanInput) {
  return x.recordKmh === null ? null : x.recordKmh * (1 + x.profile.margin.value.percent / 100)
}

/**
 * The multiplier of one figure (power, or drag area) at which the two-way result meets the required speed: the
 * secant method from a first guess by the cube law (at top speed the power goes with the cube of the speed),
 * within 0.2–5 times the figure; null where it does not converge there.
 */
function solveMultiplier(result: (k: number) => number, targetMs: number, guess: number) {
  const clamp = (k: number) => Math.min(5, Math.max(0.2, k))
  let a = clamp(guess)
  let fa = result(a) - targetMs
  let b = clamp(a * (fa > 0 ? 0.99 : 1.01))
  let fb = result(b) - targetMs
  for (let i = 0; i < 30; i++) {
    if (Math.abs(fb) < 1e-9 * targetMs) return b
    if (fb === fa) return null
    const c = clamp(b - (fb * (b - a)) / (fb - fa))
    a = b
    fa = fb
    b = c
    fb = result(b) - targetMs
  }
  return Math.abs(fb) < 1e-6 * targetMs ? b : null
}

/** The return-run budget: the latest start of the return run the profile's window allows, and the slack. */
function budget(x: PlanInput, out: DirectionPlan, back: DirectionPlan) {
  const w = x.profile.window.value
  const earliestS = out.offTimeS + out.shutdownS + x.turnaroundMin * 60
  if (w.kind !== 'elapsed') {
    return { kind: 'next-day' as const, earliestS, latestS: null, slackS: null,
      note: `the record run is on the next day${w.before ? `, leaving before ${w.before}` : ''}: the turnaround is `
        + 'overnight' }
  }
  const from = { 'start-first': 0, 'finish-first': out.runTimeS, 'start-second': 0, 'finish-second': 0 }[w.from]
  const latestS = from + w.minutes * 60 - (w.to === 'finish-second' ? back.runTimeS : 0)
  return { kind: 'elapsed' as const, earliestS, latestS, slackS: latestS - earliestS, note: null }
}

export function plan(x: PlanInput) {
  const air = densityOf(x.conditions)
  const base = bothWays(x, air.rho)
  const { out, back } = base
  const required = requiredKmh(x)
  const targetMs = required === null ? null : required * MS_KMH
  const resultWith = (m: Machine) => bothWays({ ...x, machine: m }, air.rho).resultMs
  const ratio = targetMs === null ? 1 : targetMs / base.resultMs
  const powerK = targetMs === null
    ? null
    : solveMultiplier(k => resultWith(scalePower(x.machine, k)), targetMs, ratio ** 3)
  const dragK = targetMs === null
    ? null
    : solveMultiplier(k => resultWith({ ...x.machine, cdA: x.machine.cdA * k }), targetMs, ratio ** -3)
  const findings: PlanFinding[] = []
  const pressure = pressureFinding(x.conditions.altitudeM, x.conditions.pressureHpa)
  if (pressure) findings.push(pressure)
  for (const d of [out, back]) {
    if (d.entryMs < RUNUP_SHARE * d.topMs) {
      findings.push({
        code: 'runup.short',
        message: `${d.direction}: the run-up is short: ${fmt(kmhOf(d.entryMs))} km/h at the entry trap, `
          + `${fmt(100 * d.entryMs / d.topMs, 0)} % of the ${fmt(kmhOf(d.topMs))} km/h it could reach`,
      })
    }
    if (d.overrunM > 0) {
      findings.push({
        code: 'shutdown.overrun',
        message: `${d.direction}: stops ${fmt(d.stopM, 0)} m from its start line; with the ${x.shutdown.marginM} m `
          + `run-off kept clear it overruns the course by ${fmt(d.overrunM, 0)} m`,
      })
    }
  }
  const resultKmh = kmhOf(base.resultMs)
  if (required === null) {
    findings.push({ code: 'record.none', message: 'no standing record for the class and distance: a first record' })
  }
  else if (resultKmh < required || (!x.profile.margin.value.inclusive && resultKmh === required)) {
    findings.push({ code: 'record.short', message: `the plan's result, ${fmt(resultKmh, 3)} km/h, is `
      + `${fmt(required - resultKmh, 3)} km/h short of the ${fmt(required, 3)} km/h needed` })
  }
  const window = budget(x, out, back)
  if (window.slackS !== null && window.slackS < 0) {
    findings.push({
      code: 'window.short',
      message: `the return run cannot leave in time: ${fmt(-window.slackS / 60)} min short of the profile's window `
        + 'with this turnaround',
    })
  }
  const still = x.machine.power.kind === 'constant'
    ? closedFormTopSpeed(x.machine, air.rho, x.machine.power.kW * 1000)
    : null
  return {
    air,
    stepM: STEP_M,
    topSpeed: { kmh: kmhOf(topSpeed(x.machine, air.rho, 0)), mph: mphOf(topSpeed(x.machine, air.rho, 0)),
      closedFormKmh: still === null ? null : kmhOf(still) },
    runs: [out, back].map(d => ({
      ...d,
      topKmh: kmhOf(d.topMs), entryKmh: kmhOf(d.entryMs), exitKmh: kmhOf(d.exitMs), speedKmh: kmhOf(d.speedMs),
      speedMph: mphOf(d.speedMs),
    })),
    result: { kmh: resultKmh, mph: mphOf(base.resultMs) },
    record: required === null
      ? null
      : { standingKmh: x.recordKmh!, requiredKmh: required, improvementKmh: required - x.recordKmh!,
          marginKmh: resultKmh - required },
    needed: targetMs === null
      ? null
      : {
          powerKW: powerK === null ? null : nominalKW(x.machine) * powerK,
          powerFactor: powerK,
          cdA: dragK === null ? null : x.machine.cdA * dragK,
          cdAFactor: dragK,
        },
    window,
    findings,
    sensitivity: sensitivity(x, air, base.resultMs),
  }
}
export type Plan = ReturnType<typeof plan>

/** The machine with its power figure (constant, or every point of its curve) multiplied by k. */
export const scalePower = (m: Machine, k: number): Machine => ({
  ...m,
  power: m.power.kind === 'constant'
    ? { kind: 'constant', kW: m.power.kW * k }
    : { kind: 'curve', points: m.power.points.map(p => ({ kmh: p.kmh, kW: p.kW * k })) },
})

/** The power figure's peak, kW: what a multiplier scales. */
const nominalKW = (m: Machine) =>
  m.power.kind === 'constant' ? m.power.kW : Math.max(...m.power.points.map(p => p.kW))

/** Top speed and result for ±10 % power, ±10 % CdA, ±5 °C and ±20 hPa, each alone. */
function sensitivity(x: PlanInput, air: ReturnType<typeof densityOf>, baseMs: number) {
  const row = (label: string, change: Partial<PlanInput> & { rho?: number }) => {
    const input = { ...x, ...change }
    const rho = change.rho ?? air.rho
    const resultMs = label === 'As planned' ? baseMs : bothWays(input, rho).resultMs
    return { label, topKmh: kmhOf(topSpeed(input.machine, rho, 0)), resultKmh: kmhOf(resultMs) }
  }
  const m = x.machine
  const power = (k: number) => scalePower(m, k)
  return [
    row('As planned', {}),
    row('Power +10 %', { machine: power(1.1) }),
    row('Power −10 %', { machine: power(0.9) }),
    row('CdA −10 %', { machine: { ...m, cdA: m.cdA * 0.9 } }),
    row('CdA +10 %', { machine: { ...m, cdA: m.cdA * 1.1 } }),
    row('5 °C cooler', { rho: airDensity(air.pressureHpa, air.temperatureC - 5) }),
    row('5 °C warmer', { rho: airDensity(air.pressureHpa, air.temperatureC + 5) }),
    row('Pressure +20 hPa', { rho: airDensity(air.pressureHpa + 20, air.temperatureC) }),
    row('Pressure −20 hPa', { rho: airDensity(air.pressureHpa - 20, air.temperatureC) }),
  ]
}
