import { describe, expect, it } from 'vitest'
import { computeRun } from '#shared/rules/run-sheet'
import { profiles } from '#shared/rules/profiles'

// One run over a flying kilometre timed by two systems at 1/1000 s; each states a tolerance of 0.002 s.
const traps = [
  { id: 1, label: 'K-in', positionM: '0.000', elevationM: '0' },
  { id: 2, label: 'K-out', positionM: '1000.000', elevationM: '0' },
]
const distances = [{ id: 1, label: 'Flying kilometre', nominalM: '1000.000', entryTrapId: 1, exitTrapId: 2 }]
const systems = [
  { id: 1, name: 'A', role: 'primary' as const, ticksPerSecond: 1000, toleranceS: '0.002' },
  { id: 2, name: 'B', role: 'backup' as const, ticksPerSecond: 1000, toleranceS: '0.002' },
]
/** The run with the primary timing 10.000 s and the backup 10.000 s plus `backupExtraMs`. */
const run = (backupExtraMs: number) => computeRun({
  profile: profiles['intl-motorcycle'],
  direction: 'out',
  headingDeg: 0,
  traps,
  distances,
  systems,
  readings: [
    { id: 1, trapId: 1, systemId: 1, ticks: '36000000' },
    { id: 2, trapId: 2, systemId: 1, ticks: '36010000' },
    { id: 3, trapId: 1, systemId: 2, ticks: '36000000' },
    { id: 4, trapId: 2, systemId: 2, ticks: String(36010000 + backupExtraMs) },
  ],
})

describe('primary against backup', () => {
  it('agree within the two systems\' stated tolerances added together', () => {
    // Common practice of comparing two instruments: each may be off by its own tolerance, so the
    // two agree while they differ by at most 0.002 + 0.002 = 0.004 s.
    expect(run(3).crossChecks[0]).toMatchObject({ differenceS: '0.003000', toleranceS: '0.004000', ok: true })
    expect(run(4).crossChecks[0]!.ok).toBe(true)
    const apart = run(5)
    expect(apart.crossChecks[0]).toMatchObject({ differenceS: '0.005000', ok: false })
    expect(apart.findings.map(f => [f.code, f.severity])).toContainEqual(['timing.cross-check', 'fail'])
  })

  it('time the kilometre from the entry to the exit trap: 1000 m in 10.000 s is 360.000 km/h', () => {
    // Hand computation: 1000 / 10 × 3.6 = 360 km/h exactly.
    expect(run(0).systems[0]!.distances[0]).toMatchObject({ timeS: '10.000', kmh: '360.000' })
  })
})

describe('a run over midnight', () => {
  // Times of day restart at 00:00:00 (ISO 8601 time of day); a run lasts minutes, so an exit trap read at
  // 00:00:05.000 after an entry trap at 23:59:55.000 was passed 10.000 s later, the next day.
  const overMidnight = (direction: 'out' | 'back', first: string, second: string) => computeRun({
    profile: profiles['intl-motorcycle'],
    direction,
    headingDeg: 0,
    traps,
    distances,
    systems: [systems[0]!],
    readings: [
      { id: 1, trapId: direction === 'out' ? 1 : 2, systemId: 1, ticks: first },
      { id: 2, trapId: direction === 'out' ? 2 : 1, systemId: 1, ticks: second },
    ],
  })

  it('carries the later trap into the next day, either way along the course', () => {
    // 23:59:55.000 is 86 395 000 ms; 00:00:05.000 is 5000 ms. 1000 m in 10.000 s = 360.000 km/h (1 km/h = 1/3.6 m/s).
    for (const direction of ['out', 'back'] as const) {
      const r = overMidnight(direction, '86395000', '5000')
      expect(r.findings).toEqual([])
      expect(r.systems[0]!.distances[0]).toMatchObject({ timeS: '10.000', kmh: '360.000' })
    }
  })

  it('still refuses a trap read out of order within the same day', () => {
    const r = overMidnight('out', '36010000', '36000000')
    expect(r.findings.map(f => f.code)).toEqual(['reading.out-of-order'])
  })
})

// A run worked by hand: traps at 0, 500 and 1500 m (listed out of order), the flying kilometre from the 500 m trap to
// the 1500 m trap; the primary counts 1/10 000 s and states 0.0005 s, the backup 1/1000 s and 0.001 s. Speeds: 500 m
// in 5 s = 100 m/s = 360.000 km/h = 223.693 mph (100 ÷ 0.44704 = 223.6936…, truncated); 1000 m in 9 s = 111.1… m/s
// = 400.000 km/h = 248.548 mph (1000 ÷ 9 ÷ 0.44704 = 248.5484…). Times of day in ticks: 10:00:00 = 36 000 s.
describe('a run of three traps and two systems, worked by hand', () => {
  const T = [
    { id: 3, label: 'T1500', positionM: '1500', elevationM: '0' },
    { id: 1, label: 'T0', positionM: '0', elevationM: '0' },
    { id: 2, label: 'T500', positionM: '500', elevationM: '0' },
  ]
  const km = [{ id: 9, label: 'Flying kilometre', nominalM: '1000', entryTrapId: 2, exitTrapId: 3 }]
  const S = [
    { id: 1, name: 'Beam A', role: 'primary' as const, ticksPerSecond: 10_000, toleranceS: '0.0005' },
    { id: 2, name: 'Beam B', role: 'backup' as const, ticksPerSecond: 1000, toleranceS: '0.001' },
  ]
  const p = (trapId: number, s: number) => ({ id: trapId, trapId, systemId: 1, ticks: String(Math.round((36_000 + s) * 10_000)) })
  const b = (trapId: number, s: number) => ({ id: 10 + trapId, trapId, systemId: 2, ticks: String(Math.round((36_000 + s) * 1000)) })
  const compute = (direction: 'out' | 'back', readings: ReturnType<typeof p>[], weather: { windSpeedMs: string, windFromDeg: string } | null = null) =>
    computeRun({ profile: profiles['intl-motorcycle'], direction, headingDeg: 350, traps: T, distances: km, systems: S, readings, weather })

  it('times each segment in the order of the run, and the kilometre, by each system', () => {
    const r = compute('out', [p(1, 0), p(2, 5), p(3, 14), b(2, 5), b(3, 14.001)])
    const [primary, backup] = r.systems
    expect(primary!.segments).toEqual([
      { fromTrapId: 1, toTrapId: 2, lengthM: '500.000', midpointM: 250, timeS: '5.0000', kmh: '360.000', mph: '223.693', exactS: expect.anything() },
      { fromTrapId: 2, toTrapId: 3, lengthM: '1000.000', midpointM: 1000, timeS: '9.0000', kmh: '400.000', mph: '248.548', exactS: expect.anything() },
    ])
    expect(primary!.distances).toMatchObject([{ distanceId: 9, label: 'Flying kilometre', timeS: '9.0000', kmh: '400.000', mph: '248.548' }])
    // The backup missed the first trap: one segment. 1000 m in 9.001 s = 399.955 km/h (3600 ÷ 9.001 = 399.9555…).
    expect(backup!.segments.map(x => [x.fromTrapId, x.toTrapId, x.timeS, x.kmh])).toEqual([[2, 3, '9.001', '399.955']])
    expect(backup!.role).toBe('backup')
    // Within 0.0005 + 0.001 = 0.0015 s: they agree; the primary's time counts.
    expect(r.crossChecks).toEqual([{ distanceId: 9, label: 'Flying kilometre', differenceS: '0.001000', toleranceS: '0.001500', ok: true }])
    expect(r.official[9]).toEqual({ exactS: primary!.distances[0]!.exactS, systemId: 1 })
    expect(r.findings).toEqual([])
    expect(r.wind).toBeNull()
  })

  it('runs back from the far end: the kilometre timed from its exit trap to its entry trap', () => {
    const r = compute('back', [p(3, 0), p(2, 9), p(1, 14), b(3, 0), b(2, 9)])
    expect(r.systems[0]!.segments.map(x => [x.fromTrapId, x.toTrapId, x.timeS, x.midpointM])).toEqual([[3, 2, '9.0000', 1000], [2, 1, '5.0000', 250]])
    expect(r.systems[0]!.distances[0]).toMatchObject({ timeS: '9.0000', kmh: '400.000' })
    expect(r.findings).toEqual([])
  })

  it('differs beyond the tolerances added together: a failing finding naming both times', () => {
    const r = compute('out', [p(2, 5), p(3, 14), b(2, 5), b(3, 14.002)])
    expect(r.crossChecks[0]).toMatchObject({ differenceS: '0.002000', toleranceS: '0.001500', ok: false })
    expect(r.findings).toEqual([{ code: 'timing.cross-check', severity: 'fail', distanceId: 9,
      message: 'Flying kilometre: primary 9.0000 s and backup 9.002 s differ by 0.002000 s, more than the tolerance of '
        + '0.001500 s. The timekeeper must resolve it in writing.' }])
    // Still the primary's time that counts.
    expect(r.official[9]!.systemId).toBe(1)
  })

  it('warns when only the backup timed the distance, and takes the backup\'s time', () => {
    const r = compute('out', [p(2, 5), b(2, 5), b(3, 14.001)])
    expect(r.crossChecks).toEqual([])
    expect(r.findings).toEqual([{ code: 'timing.backup-only', severity: 'warn', distanceId: 9,
      message: 'Flying kilometre: only the backup system timed this distance.' }, { code: 'timing.single-system',
      severity: 'fail', distanceId: 9, message: 'Flying kilometre: timed by the backup system (Beam B) only; the '
        + 'primary system (Beam A) has no time over it. The chief timekeeper must write why.' }])
    expect(r.official[9]!.systemId).toBe(2)
    // Only the primary (the backup missed the exit trap): its time counts, and the gap is a finding until the chief
    // timekeeper writes why (two systems time every run: common practice). Neither: no official time.
    expect(compute('out', [p(2, 5), p(3, 14), b(2, 5)]).findings).toEqual([{ code: 'timing.single-system',
      severity: 'fail', distanceId: 9, message: 'Flying kilometre: timed by the primary system (Beam A) only; the '
        + 'backup system (Beam B) has no time over it. The chief timekeeper must write why.' }])
    expect(compute('out', [p(2, 5), p(3, 14)]).official[9]!.systemId).toBe(1)
    // With one system set up for the run, there is nothing to write.
    expect(computeRun({ profile: profiles['intl-motorcycle'], direction: 'out', headingDeg: 350, traps: T, distances: km,
      systems: [S[0]!], readings: [p(2, 5), p(3, 14)] }).findings).toEqual([])
    expect(compute('out', [p(2, 5), b(2, 5)]).official).toEqual({})
  })

  it('refuses a time not after the trap before it, equal times included, and names both traps', () => {
    const r = compute('out', [p(1, 5), p(2, 5), p(3, 14), b(2, 5), b(3, 14)])
    expect(r.findings).toEqual([{ code: 'reading.out-of-order', severity: 'fail', trapId: 2, systemId: 1,
      message: 'Beam A: the time at T500 (10:00:05.0000) is not after the time at T0 (10:00:05.0000), the trap before it on this run.' }])
    expect(r.systems[0]!.segments.map(x => x.fromTrapId)).toEqual([2])
  })

  it('flags a segment faster than 1500 km/h as a mistyped time; 1500 km/h itself is not flagged', () => {
    // 500 m in 1 s = 1800.000 km/h; 500 m in 1.2 s = 1500.000 km/h exactly.
    const sanity = (r: ReturnType<typeof compute>) => r.findings.filter(f => f.code === 'reading.implausible-speed')
    const fast = compute('out', [p(1, 0), p(2, 1), p(3, 10), b(2, 1), b(3, 10)])
    expect(sanity(fast)).toEqual([{ code: 'reading.implausible-speed', severity: 'fail', trapId: 2, systemId: 1,
      message: 'Beam A: 1800.000 km/h from T0 to T500 is beyond 1500 km/h; check the times.' }])
    expect(sanity(compute('out', [p(1, 0), p(2, 1.2), p(3, 10.2), b(2, 1.2), b(3, 10.2)]))).toEqual([])
  })

  it('flags consecutive segment speeds no machine could join, beyond 2 g either way (a time mistyped, a channel swapped)', () => {
    // 2 g = 19.6133 m/s² (standard gravity × 2; the 2 g limit is common practice, from memory). Midpoints of the
    // segments T0–T500 and T500–T1500: 250 m and 1000 m, 750 m apart; a = (v2² − v1²) ÷ (2 × 750 m).
    // The T500 trap read 3 s early: 500 m in 2 s (900 km/h), then 1000 m in 12 s (300 km/h):
    // (83.333² − 250²) ÷ 1500 = −37.04 m/s², 3.8 g.
    const swapped = compute('out', [p(1, 0), p(2, 2), p(3, 14), b(2, 2), b(3, 14)])
    expect(swapped.findings).toEqual([{ code: 'reading.implausible-acceleration', severity: 'fail', trapId: 2, systemId: 1,
      message: 'Beam A: 900.000 km/h from T0 to T500, then 300.000 km/h from T500 to T1500, losing speed at 3.8 g, '
        + 'more than the 2 g a machine can in the measured distance: check the times and the channels.' }])
    // At the edge: 360 km/h (100 m/s), then 1000 m in 5.0366 s = 714.767 km/h (truncated): (198.5464² − 100²) ÷ 1500 =
    // 19.6138 m/s², over 2 g; in 5.0367 s, 714.753 km/h: 19.6127 m/s², under.
    expect(compute('out', [p(1, 0), p(2, 5), p(3, 10.0366), b(2, 5), b(3, 10.0366)]).findings.map(f => f.code)).toEqual(['reading.implausible-acceleration'])
    expect(compute('out', [p(1, 0), p(2, 5), p(3, 10.0367), b(2, 5), b(3, 10.0367)]).findings).toEqual([])
    // 360 then 400 km/h (the run above): 1.56 m/s², nothing to say.
    expect(compute('out', [p(1, 0), p(2, 5), p(3, 14), b(2, 5), b(3, 14)]).findings).toEqual([])
  })

  it('resolves the wind along each direction: from 170° at 3 m/s is a tail wind out (heading 350°), a head wind back', () => {
    const w = { windSpeedMs: '3', windFromDeg: '170' }
    const out = compute('out', [p(2, 5), p(3, 14)], w)
    expect(out.wind!.headingDeg).toBe(350)
    expect(out.wind!.headMs).toBeCloseTo(-3, 9)
    const back = compute('back', [p(3, 0), p(2, 9)], w)
    expect(back.wind!.headingDeg).toBe(170)
    expect(back.wind!.headMs).toBeCloseTo(3, 9)
    expect(back.wind!.crossMs).toBeCloseTo(0, 9)
  })
})
