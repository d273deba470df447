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
