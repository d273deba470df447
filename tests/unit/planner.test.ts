import { beforeEach, describe, expect, it } from 'vitest'
import { profiles } from '#shared/rules/profiles'
import { airDensity, standardAtmosphere } from '#shared/rules/planner/atmosphere'
import { closedFormTopSpeed, resistanceN, topSpeed, type Machine } from '#shared/rules/planner/road-load'
import { integrateRun } from '#shared/rules/planner/run'
import { plan, scalePower, type PlanInput } from '#shared/rules/planner/plan'

// The planner's physics against outside sources and hand-worked cases. Machine figures are invented for the test.
const machine: Machine = {
  massKg: 300, rotatingMassKg: 20, cdA: 0.12, crr: 0.012, efficiency: 0.92,
  power: { kind: 'constant', kW: 150 }, maxTractiveN: 2500,
}

describe('the standard atmosphere', () => {
  // ICAO Doc 7488/3 (= ISO 2533:1975) table, geopotential altitude: temperature, pressure, density (values recalled
  // from memory of the published table, to the figures it prints).
  const table: [number, number, number, number][] = [
    [0, 288.15, 101_325, 1.2250],
    [1000, 281.65, 89_874.6, 1.1116],
    [2000, 275.15, 79_495.2, 1.0065],
    [3000, 268.65, 70_108.5, 0.90912],
    [5000, 255.65, 54_019.9, 0.73612],
    [11_000, 216.65, 22_632.1, 0.36392],
  ]
  it.each(table)('at %i m: %f K, %f Pa, %f kg/m³', (h, t, p, rho) => {
    const a = standardAtmosphere(h)
    expect(a.temperatureK).toBeCloseTo(t, 6)
    expect(Math.abs(a.pressurePa - p) / p).toBeLessThan(5e-6)
    expect(Math.abs(a.density - rho) / rho).toBeLessThan(6e-5)
  })
  it('gives the density of the day by the ideal gas law', () => {
    // 15 °C and 1013.25 hPa is the standard sea level: 1.2250 kg/m³ (ISO 2533).
    expect(airDensity(1013.25, 15)).toBeCloseTo(1.2250, 4)
    // A dry lake at about 1300 m on a hot day: 872.4 hPa and 27.5 °C give 872.4e2 / (287.05287 × 300.65).
    expect(airDensity(872.4, 27.5)).toBeCloseTo(87_240 / (287.05287 * 300.65), 12)
  })
})

describe('top speed where the power equals the road load', () => {
  it('is the root of the cubic (Cardano), and the bisection finds the same', () => {
    const rho = 1.1
    const v = closedFormTopSpeed(machine, rho, 150_000)
    // At that speed the power at the wheel is exactly the road load times the speed.
    expect(resistanceN(machine, rho, v, 0) * v).toBeCloseTo(0.92 * 150_000, 6)
    expect(topSpeed(machine, rho, 0)).toBeCloseTo(v, 6)
  })
  it('with no rolling resistance is (2·η·P / (ρ·CdA))^(1/3), worked by hand', () => {
    // 2 × 100 000 W / (1.225 × 0.2 m²) = 816 326.53; its cube root is 93.459 m/s (336.45 km/h).
    const v = closedFormTopSpeed({ ...machine, crr: 0, efficiency: 1, cdA: 0.2 }, 1.225, 100_000)
    expect(v).toBeCloseTo(93.459, 3)
  })
})

describe('the integrated run', () => {
  it('matches uniform acceleration where only the traction limit acts (v² = 2·a·s, t = v/a)', () => {
    // No drag, no rolling resistance, power to spare: 2500 N on 250 kg effective is 10 m/s²; after 500 m,
    // 100 m/s in 10 s (worked by hand).
    const m = { ...machine, massKg: 230, rotatingMassKg: 20, cdA: 0, crr: 0, power: { kind: 'constant' as const, kW: 1e5 } }
    const run = integrateRun({ machine: m, rho: 1.2, headWindMs: 0, powerOffAtM: 500, marks: [125, 500], sampleEveryM: 50 })
    expect(run.at[0]!.vMs).toBeCloseTo(50, 6) // √(2 × 10 × 125)
    expect(run.at[0]!.tS).toBeCloseTo(5, 6)
    expect(run.offVMs).toBeCloseTo(100, 6)
    expect(run.offTS).toBeCloseTo(10, 6)
  })
  it('matches constant power with no resistance (v³ = 3·η·P·s / m) once traction no longer limits', () => {
    // From 200 m on, power limits (P/v < traction): m·v²·dv/ds = P gives v³ − v₀³ = 3·P·(s − s₀)/m. Worked
    // from the integrated speed at 200 m to 1000 m.
    const m = { ...machine, massKg: 230, rotatingMassKg: 20, cdA: 0, crr: 0, efficiency: 1, maxTractiveN: 4000 }
    const run = integrateRun({ machine: m, rho: 1.2, headWindMs: 0, powerOffAtM: 1000, marks: [200, 1000], sampleEveryM: 100 })
    const v0 = run.at[0]!.vMs
    expect(150_000 / v0).toBeLessThan(4000)
    expect(run.at[1]!.vMs).toBeCloseTo(Math.cbrt(v0 ** 3 + (3 * 150_000 * 800) / 250), 4)
  })
  it('approaches the closed-form top speed on a long run, and never passes it', () => {
    const rho = 1.0
    const top = closedFormTopSpeed(machine, rho, 150_000)
    const run = integrateRun({ machine, rho, headWindMs: 0, powerOffAtM: 20_000, marks: [20_000], sampleEveryM: 1000 })
    expect(run.offVMs).toBeLessThan(top)
    expect(run.offVMs / top).toBeGreaterThan(0.999)
  })
})

// A course as a team would set it up: 8 km of salt, the flying mile from 3.5 km; the international motorcycle
// profile (two runs in opposite directions, 2 h from the start of the first to the finish of the second, seen).
const input: PlanInput = {
  machine,
  conditions: { altitudeM: 1290, temperatureC: 27.5, pressureHpa: 872.4, windMs: 2, windFromDeg: 0 },
  course: { label: 'Flying mile', lengthM: 8000, headingDeg: 0, entryM: 3500, exitM: 3500 + 1609.344 },
  shutdown: { decelerationMs2: 3, marginM: 300 },
  profile: profiles['intl-motorcycle'],
  recordKmh: 330,
  turnaroundMin: 45,
}

describe('the plan', () => {
  // Computed in each test, never while the tests are collected: a mutant is switched on only inside a test.
  let p: ReturnType<typeof plan>
  beforeEach(() => {
    p = plan(input)
  })
  it('runs each way with its wind component, and averages by the profile (distance over the mean time)', () => {
    const [out, back] = p.runs
    // Wind from 0° at 2 m/s: a 2 m/s head wind on the out run (heading 0°), a tail wind back.
    expect(out!.headWindMs).toBeCloseTo(2, 9)
    expect(back!.headWindMs).toBeCloseTo(-2, 9)
    expect(back!.speedKmh).toBeGreaterThan(out!.speedKmh)
    expect(p.result.kmh).toBeCloseTo((1609.344 / ((out!.timeS + back!.timeS) / 2)) * 3.6, 9)
    expect(p.result.mph).toBeCloseTo(p.result.kmh / 1.609344, 9)
  })
  it('solves the power and the drag area that beat the record by the margin, and they give it back', () => {
    const needed = p.needed!
    const required = p.record!.requiredKmh
    const withPower = plan({ ...input, machine: scalePower(machine, needed.powerFactor!) })
    expect(withPower.result.kmh).toBeCloseTo(required, 3)
    expect(needed.powerKW).toBeCloseTo(150 * needed.powerFactor!, 9)
    const withDrag = plan({ ...input, machine: { ...machine, cdA: needed.cdA! } })
    expect(withDrag.result.kmh).toBeCloseTo(required, 3)
  })
  it('budgets the return run inside the profile\'s window', () => {
    const [out, back] = p.runs
    // 120 min from the start of the first run to the finish of the second: the return run leaves by
    // 7200 s less its own run time; it can leave once the first run, its shut-down and the turnaround are over.
    expect(p.window.latestS).toBeCloseTo(7200 - back!.runTimeS, 9)
    expect(p.window.earliestS).toBeCloseTo(out!.offTimeS + out!.shutdownS + 45 * 60, 9)
    // One measured distance: power goes off at its exit trap, the run's finish.
    expect(out!.offTimeS).toBe(out!.runTimeS)
    expect(p.window.slackS).toBeCloseTo(p.window.latestS! - p.window.earliestS, 9)
    const slow = plan({ ...input, turnaroundMin: 130 })
    expect(slow.findings.map(f => f.code)).toContain('window.short')
  })
  it('finds a short run-up and a shut-down that overruns the course', () => {
    const short = plan({ ...input, course: { ...input.course, lengthM: 2600, entryM: 300, exitM: 300 + 1609.344 } })
    const codes = short.findings.map(f => f.code)
    expect(codes).toContain('runup.short')
    expect(codes).toContain('shutdown.overrun')
    // Shut-down at 3 m/s² from the exit speed: v² / (2·a) past the exit trap.
    const out = short.runs[0]!
    expect(out.stopM).toBeCloseTo(out.exitM + out.exitMs ** 2 / 6, 9)
  })
  it('times every measured distance of the pass, the kilometre inside the mile the same as alone', () => {
    // The kilometre centred in the mile: 304.672 m in from each trap of the mile (1609.344 − 1000 = 609.344 m).
    const kilometre = { label: 'Flying kilometre', entryM: 3804.672, exitM: 4804.672 }
    const both = plan({ ...input, course: { ...input.course, others: [kilometre] } })
    const alone = plan({ ...input, course: { ...input.course, ...kilometre } })
    for (const i of [0, 1]) {
      const k = both.runs[i]!.distances.find(d => d.label === 'Flying kilometre')!
      // The back run meets the kilometre mirrored, from the other end: the same positions here, as it is centred.
      expect(k.timeS).toBeCloseTo(alone.runs[i]!.timeS, 6)
      expect(k.entryKmh).toBeCloseTo(alone.runs[i]!.entryKmh, 6)
    }
    expect(both.result.kmh).toBeCloseTo(p.result.kmh, 9)
  })
  it('shows which figure matters: more power and less drag are faster, warmer and lower pressure air too', () => {
    const by = Object.fromEntries(p.sensitivity.map(r => [r.label, r]))
    const base = by['As planned']!.resultKmh
    expect(base).toBeCloseTo(p.result.kmh, 9)
    expect(by['Power +10 %']!.resultKmh).toBeGreaterThan(base)
    expect(by['Power −10 %']!.resultKmh).toBeLessThan(base)
    expect(by['CdA −10 %']!.resultKmh).toBeGreaterThan(base)
    expect(by['5 °C warmer']!.resultKmh).toBeGreaterThan(base)
    expect(by['Pressure −20 hPa']!.resultKmh).toBeGreaterThan(base)
    // At top speed drag dominates: 10 % more power gives about 1.1^(1/3) ≈ 3.2 % more speed (common practice),
    // a little more since rolling resistance grows only with the speed, not its cube.
    expect(by['Power +10 %']!.topKmh / by['As planned']!.topKmh).toBeGreaterThan(1.0322)
    expect(by['Power +10 %']!.topKmh / by['As planned']!.topKmh).toBeLessThan(1.034)
  })
})

// A plan worked wholly by hand: no drag, no rolling resistance and power to spare, so only the 500 N traction limit
// acts on 250 kg (230 kg + 20 kg rotating equivalent): a uniform 2 m/s² from the line (s = a·t²/2, v² = 2·a·s). The
// measured kilometre lies 3500–4500 m from either start line of an 8000 m course, so both runs are alike.
//   entry: t = √(2·3500/2) = √3500 = 59.160798 s; exit: t = √4500 = 67.082039 s, v = √(2·2·4500) = √18000 = 134.164079 m/s
//   time over the kilometre: 67.082039 − 59.160798 = 7.921241 s → 1000 / 7.921241 = 126.242837 m/s = 454.474214 km/h
//   (× 3.6) = 282.397184 mph (÷ 0.44704, the international mile of 1959)
//   shut-down at 3 m/s² from 134.164079 m/s: 134.164079 / 3 = 44.721360 s over 18000 / (2·3) = 3000 m → stops at 7500 m
//   window (2 h from the start of the first run to the finish of the second): the return run leaves by
//   7200 − 67.082039 = 7132.917961 s, and can leave after 67.082039 + 44.721360 + 45·60 = 2811.803399 s: slack 4321.114562 s
describe('a plan worked by hand (uniform acceleration)', () => {
  const uniform: PlanInput = {
    machine: { massKg: 230, rotatingMassKg: 20, cdA: 0, crr: 0, efficiency: 1, power: { kind: 'constant', kW: 100_000 },
      maxTractiveN: 500 },
    conditions: { altitudeM: 0, temperatureC: 15, pressureHpa: 1013.25, windMs: 0, windFromDeg: 0 },
    course: { label: 'Flying kilometre', lengthM: 8000, headingDeg: 0, entryM: 3500, exitM: 4500 },
    shutdown: { decelerationMs2: 3, marginM: 300 },
    // A 1 % margin, reached exactly counting (the international automobile profile's kind of rule).
    profile: { ...profiles['intl-motorcycle'], margin: { value: { percent: 1, inclusive: true }, source: 'test', certainty: 'seen' } },
    recordKmh: 450,
    turnaroundMin: 45,
  }
  let p: ReturnType<typeof plan>
  beforeEach(() => {
    p = plan(uniform)
  })

  it('times each run and averages them', () => {
    for (const run of p.runs) {
      expect(run.timeS).toBeCloseTo(7.921241, 5)
      expect(run.entryKmh).toBeCloseTo(Math.sqrt(14_000) * 3.6, 4) // √(2·2·3500) = 118.321596 m/s
      expect(run.exitKmh).toBeCloseTo(134.164079 * 3.6, 4)
      expect(run.runTimeS).toBeCloseTo(67.082039, 5)
    }
    expect(p.result.kmh).toBeCloseTo(454.474214, 4)
    expect(p.result.mph).toBeCloseTo(282.397184, 4)
  })

  it('shuts down in 44.72 s over 3000 m, stopping 500 m before the end (200 m inside the run-off kept clear)', () => {
    const out = p.runs[0]!
    expect(out.shutdownS).toBeCloseTo(44.721360, 5)
    expect(out.stopM).toBeCloseTo(7500, 6)
    expect(out.overrunM).toBeCloseTo(-200, 6)
    expect(p.findings.map(f => f.code)).not.toContain('shutdown.overrun')
    // 600 m of run-off kept clear: 7500 + 600 − 8000 = 100 m over the end.
    const tight = plan({ ...uniform, shutdown: { decelerationMs2: 3, marginM: 600 } })
    expect(tight.runs[0]!.overrunM).toBeCloseTo(100, 6)
    expect(tight.findings.map(f => f.code)).toContain('shutdown.overrun')
    // Exactly at the end (500 m kept clear): not an overrun.
    const edge = plan({ ...uniform, shutdown: { decelerationMs2: 3, marginM: 500 } })
    expect(edge.findings.map(f => f.code)).not.toContain('shutdown.overrun')
  })

  it('needs 454.500 km/h over a 450 km/h record with a 1 % margin: 0.026 km/h short', () => {
    expect(p.record!.requiredKmh).toBeCloseTo(454.5, 9)
    expect(p.record!.improvementKmh).toBeCloseTo(4.5, 9)
    expect(p.record!.marginKmh).toBeCloseTo(454.474214 - 454.5, 4)
    expect(p.findings.map(f => f.code)).toContain('record.short')
    // Over a 449.9 km/h record: 449.9 × 1.01 = 454.399 km/h needed, and the plan beats it by 0.075 km/h.
    const beats = plan({ ...uniform, recordKmh: 449.9 })
    expect(beats.record!.requiredKmh).toBeCloseTo(454.399, 9)
    expect(beats.findings.map(f => f.code)).not.toContain('record.short')
    // No standing record: a first record, nothing to beat.
    const first = plan({ ...uniform, recordKmh: null })
    expect(first.record).toBeNull()
    expect(first.findings.map(f => f.code)).toContain('record.none')
  })

  it('budgets the return run: leaves after 2811.8 s and by 7132.9 s, 4321.1 s of slack', () => {
    expect(p.window.earliestS).toBeCloseTo(2811.803399, 5)
    expect(p.window.latestS).toBeCloseTo(7132.917961, 5)
    expect(p.window.slackS).toBeCloseTo(4321.114562, 5)
    expect(p.findings.map(f => f.code)).not.toContain('window.short')
    // A turnaround of 117 min: 67.082 + 44.721 + 7020 = 7131.803 s, 1.115 s of slack; 118 min: 58.885 s short.
    expect(plan({ ...uniform, turnaroundMin: 117 }).window.slackS).toBeCloseTo(1.114562, 5)
    expect(plan({ ...uniform, turnaroundMin: 117 }).findings.map(f => f.code)).not.toContain('window.short')
    expect(plan({ ...uniform, turnaroundMin: 118 }).window.slackS).toBeCloseTo(-58.885438, 5)
    expect(plan({ ...uniform, turnaroundMin: 118 }).findings.map(f => f.code)).toContain('window.short')
  })

  it('says each finding in words, with the figures worked above', () => {
    const message = (x: PlanInput, code: string) => plan(x).findings.find(f => f.code === code)?.message
    expect(message(uniform, 'record.short'))
      .toBe('the plan\'s result, 454.474 km/h, is 0.026 km/h short of the 454.500 km/h needed')
    // 58.885 s short is 0.98 min, said to a tenth.
    expect(message({ ...uniform, turnaroundMin: 118 }, 'window.short'))
      .toBe('the return run cannot leave in time: 1.0 min short of the profile\'s window with this turnaround')
    expect(message({ ...uniform, shutdown: { decelerationMs2: 3, marginM: 600 } }, 'shutdown.overrun'))
      .toBe('out: stops 7500 m from its start line; with the 600 m run-off kept clear it overruns the course by 100 m')
    // With no drag the machine could go on gaining: the top-speed search stops at its ceiling, 3200 m/s
    // (11 520 km/h), so the run-up is short: 118.32 m/s (426.0 km/h) at the entry is 4 % of it.
    expect(message(uniform, 'runup.short')).toBe('out: the run-up is short: 426.0 km/h at the entry trap, 4 % of the 11520.0 km/h it could reach')
    expect(message({ ...uniform, recordKmh: null }, 'record.none')).toBe('no standing record for the class and distance: a first record')
  })

  it('draws the shut-down after the exit trap: ten points to the stop, the speed falling as √(1 − f)', () => {
    const samples = p.runs[0]!.samples
    const after = samples.filter(x => x.m > 4500)
    expect(after).toHaveLength(10)
    expect(after[0]!.m).toBeCloseTo(4800, 6) // 4500 + 0.1 × 3000
    expect(after[0]!.vMs).toBeCloseTo(134.164079 * Math.sqrt(0.9), 5)
    expect(after.at(-1)!.m).toBeCloseTo(7500, 6)
    expect(after.at(-1)!.vMs).toBeCloseTo(0, 4) // f sums ten tenths in floating point: 1 − f is about 1e-16
    expect(samples[0]).toEqual({ m: 0, vMs: 0 })
  })
})
