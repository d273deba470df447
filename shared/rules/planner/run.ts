// A run along the course by integrating the equation of motion over distance: (m + m_rot)·v·dv/ds = F(v).
// The variable is u = v² (du/ds = 2·a), stepped with the classical fourth-order Runge–Kutta method; the
// time over each step is 2·Δs/(v₀ + v₁), exact where the acceleration is constant over the step.
import { accelerationOf, type Machine } from './road-load'

/** The distance step of the integration, m. */
export const STEP_M = 1

export interface RunInput {
  machine: Machine
  rho: number
  headWindMs: number
  /** Where power goes off (the exit trap), m from the start line. */
  powerOffAtM: number
  /** Positions of interest, m from the start line: the speed and time there are reported. */
  marks: number[]
  /** Samples for the chart: one every this many metres. */
  sampleEveryM: number
}

export interface RunTrace {
  at: { m: number, vMs: number, tS: number }[]
  samples: { m: number, vMs: number }[]
  /** Speed and elapsed time at power off. */
  offVMs: number
  offTS: number
}

export function integrateRun(x: RunInput): RunTrace {
  const { machine, rho, headWindMs } = x
  const a = accelerationOf(machine, rho, headWindMs)
  const du = (u: number) => 2 * a(Math.sqrt(u > 0 ? u : 0))
  const marks = [...x.marks].sort((a, b) => a - b)
  const at: RunTrace['at'] = []
  const samples: RunTrace['samples'] = [{ m: 0, vMs: 0 }]
  let u = 0
  let t = 0
  let s = 0
  let mark = 0
  let nextSample = x.sampleEveryM
  while (s < x.powerOffAtM - 1e-9) {
    const h = Math.min(STEP_M, x.powerOffAtM - s)
    const k1 = du(u)
    const k2 = du(u + (h / 2) * k1)
    const k3 = du(u + (h / 2) * k2)
    const k4 = du(u + h * k3)
    const u1 = Math.max(u + (h / 6) * (k1 + 2 * k2 + 2 * k3 + k4), 0)
    const v0 = Math.sqrt(u)
    const v1 = Math.sqrt(u1)
    const dt = v0 + v1 > 0 ? (2 * h) / (v0 + v1) : 0
    // A mark inside this step: speed and time interpolated in the step (u and t are smooth in s).
    while (mark < marks.length && marks[mark]! <= s + h + 1e-9) {
      const f = (marks[mark]! - s) / h
      const um = u + f * (u1 - u)
      const vm = Math.sqrt(um)
      at.push({ m: marks[mark]!, vMs: vm, tS: t + (v0 + vm > 0 ? (2 * f * h) / (v0 + vm) : 0) })
      mark++
    }
    u = u1
    t += dt
    s += h
    if (s >= nextSample - 1e-9) {
      samples.push({ m: s, vMs: v1 })
      nextSample += x.sampleEveryM
    }
    if (u === 0 && s > 0) throw new RangeError('the machine cannot move: the road load exceeds its tractive force')
  }
  return { at, samples, offVMs: Math.sqrt(u), offTS: t }
}
