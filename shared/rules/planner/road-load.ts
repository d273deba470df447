// The road-load model of a machine on a straight, level course: aerodynamic drag ½·ρ·CdA·v_air², rolling
// resistance Crr·m·g, and the power at the wheel η·P(v), limited by the tractive force the tyres can carry.
import { G0 } from './atmosphere'

export type PowerFigure
  = | { kind: 'constant', kW: number }
  /** The team's curve: power at the motor over road speed, linearly between points, flat past the ends. */
    | { kind: 'curve', points: { kmh: number, kW: number }[] }

export interface Machine {
  /** Mass with rider and fluids, kg. */
  massKg: number
  /** Equivalent translational mass of the rotating parts (wheels, motor, drivetrain), kg. */
  rotatingMassKg: number
  /** Drag area Cd·A, m². */
  cdA: number
  /** Rolling resistance coefficient. */
  crr: number
  /** Drivetrain efficiency, motor to wheel, 0–1. */
  efficiency: number
  power: PowerFigure
  /** The largest tractive force the driven tyre carries on this surface, N. */
  maxTractiveN: number
}

/** Power at the motor, W, at a road speed in m/s. */
export function motorPowerW(power: PowerFigure, vMs: number): number {
  if (power.kind === 'constant') return power.kW * 1000
  const kmh = vMs * 3.6
  const pts = power.points
  if (kmh <= pts[0]!.kmh) return pts[0]!.kW * 1000
  for (let i = 1; i < pts.length; i++) {
    const a = pts[i - 1]!
    const b = pts[i]!
    if (kmh <= b.kmh) return (a.kW + ((b.kW - a.kW) * (kmh - a.kmh)) / (b.kmh - a.kmh)) * 1000
  }
  return pts.at(-1)!.kW * 1000
}

/** Resisting force, N, at a road speed with a head-wind component (negative: tail wind), in air of density ρ. */
export function resistanceN(m: Machine, rho: number, vMs: number, headWindMs: number) {
  const air = vMs + headWindMs
  return 0.5 * rho * m.cdA * air * Math.abs(air) + m.crr * m.massKg * G0
}

/**
 * The net accelerating force over the effective mass, m/s², as a function of road speed for one machine, air
 * and wind: the figures looked up once, since a run evaluates it some twenty thousand times.
 */
export function accelerationOf(m: Machine, rho: number, headWindMs: number): (vMs: number) => number {
  const k = 0.5 * rho * m.cdA
  const rolling = m.crr * m.massKg * G0
  const mass = m.massKg + m.rotatingMassKg
  const eta = m.efficiency
  const traction = m.maxTractiveN
  const constantW = m.power.kind === 'constant' ? m.power.kW * 1000 : null
  return (v) => {
    const p = constantW ?? motorPowerW(m.power, v)
    const drive = Math.min(traction, (eta * p) / (v > 1e-9 ? v : 1e-9))
    const air = v + headWindMs
    return (drive - k * air * Math.abs(air) - rolling) / mass
  }
}

/**
 * Top speed in still air at constant power, where η·P = (½·ρ·CdA·v² + Crr·m·g)·v: the one positive root of
 * the depressed cubic v³ + p·v + q = 0 with p = 2·Crr·m·g/(ρ·CdA), q = −2·η·P/(ρ·CdA), by Cardano's formula
 * (p > 0: one real root).
 */
export function closedFormTopSpeed(m: Machine, rho: number, powerW: number): number {
  const k = 0.5 * rho * m.cdA
  const p = (m.crr * m.massKg * G0) / k
  const q = -(m.efficiency * powerW) / k
  const d = Math.sqrt((q * q) / 4 + (p * p * p) / 27)
  return Math.cbrt(-q / 2 + d) + Math.cbrt(-q / 2 - d)
}

/**
 * Top speed with the power figure as given (constant or a curve) and a wind component: the speed where the
 * power at the wheel meets the road load, by bisection (the surplus falls as speed rises).
 */
export function topSpeed(m: Machine, rho: number, headWindMs: number): number {
  const surplus = (v: number) => m.efficiency * motorPowerW(m.power, v) - resistanceN(m, rho, v, headWindMs) * v
  let lo = 0.01
  let hi = 50
  while (surplus(hi) > 0 && hi < 2000) hi *= 2
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2
    if (surplus(mid) > 0) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}
