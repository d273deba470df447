import { describe, expect, it } from 'vitest'
import { checkGradient, checkWind, crossCheck, gradientPercent, massClass, windComponents } from '#shared/rules/checks'
import { fromDecimal, q, toFixed } from '#shared/rules/exact'
import { checkMeasuredDistance } from '#shared/rules/course'
import { copyProfile, profiles } from '#shared/rules/profiles'
import { parseTimeOfDay, segmentTime } from '#shared/rules/timing'

describe('wind components', () => {
  it('resolves head, tail and cross wind against the heading', () => {
    // Source: vector resolution of the wind into components along and across the heading, θ = β − h;
    // head = W·cos θ, cross = W·sin θ (common practice of wind measurement for records).
    expect(windComponents(5, 90, 90)).toEqual({ headMs: 5, crossMs: 0 }) // wind from ahead
    expect(windComponents(5, 270, 90).headMs).toBeCloseTo(-5, 12) // from behind: tail-wind
    expect(windComponents(4, 180, 90).crossMs).toBeCloseTo(4, 12)
    const w = windComponents(3, 30, 0)
    expect(w.headMs).toBeCloseTo(3 * Math.sqrt(3) / 2, 12)
    expect(w.crossMs).toBeCloseTo(1.5, 12)
  })

  it('the return run, heading + 180°, turns a head-wind into the same tail-wind', () => {
    const out = windComponents(3, 10, 0)
    const back = windComponents(3, 10, 180)
    expect(back.headMs).toBeCloseTo(-out.headMs, 12)
  })
})

describe('the tail-wind limit', () => {
  // A profile adapted with a 2.0 m/s limit, as athletics sets for sprint and jump records (World Athletics rules: a
  // following wind of at most 2.0 m/s counts; recalled from memory). At the limit counts; a hundredth over does not.
  const limited = copyProfile(profiles['intl-automobile'], {
    tailWindLimitMs: { value: 2, source: 'test rulebook, art. 1', certainty: 'seen' },
  })
  it.each([
    [{ headMs: -2, crossMs: 0 }, []], // exactly at the limit
    [{ headMs: -1.99, crossMs: 0 }, []], // a hundredth inside
    [{ headMs: -2.01, crossMs: 0 }, ['wind.tail-over-limit']], // a hundredth over
    [{ headMs: 5, crossMs: 0 }, []], // a head wind never counts against
    [{ headMs: 0, crossMs: 9 }, []], // a pure cross wind
  ] as const)('%o → %o', (wind, codes) => {
    expect(checkWind(limited, wind).map(f => f.code)).toEqual(codes)
  })
  it('names the limit and its source in the finding, and fails the run', () => {
    const [f] = checkWind(limited, { headMs: -2.5, crossMs: 0 })
    expect(f).toMatchObject({ severity: 'fail', rule: { name: 'Tail-wind limit', value: '2 m/s', source: 'test rulebook, art. 1', certainty: 'seen' } })
    expect(f!.message).toBe('Tail-wind component 2.50 m/s is over the profile\'s limit of 2 m/s.')
  })
  it('has no limit in the library\'s profiles (no published one found): any tail wind passes', () => {
    for (const p of Object.values(profiles)) expect(checkWind(p, { headMs: -30, crossMs: 0 })).toEqual([])
  })
  it('resolves a wind of the day into the tail component first (from 180° on a heading of 0° is 3 m/s behind)', () => {
    expect(checkWind(limited, windComponents(3, 180, 0)).map(f => f.code)).toEqual(['wind.tail-over-limit'])
    expect(checkWind(limited, windComponents(3, 0, 0))).toEqual([])
  })
})

describe('gradient', () => {
  it('flags more than 1 % under the motorcycle profile', () => {
    // Source: FIM world records page (seen): gradient at most 1 %. 11 m over 1000 m is 1.1 %.
    expect(checkGradient(profiles['intl-motorcycle'], fromDecimal('1.1'))[0]?.code).toBe('course.gradient-over-limit')
    expect(checkGradient(profiles['intl-motorcycle'], fromDecimal('-1.0'))).toEqual([])
  })
})

describe('measured distance against its survey', () => {
  const mile = (exitM: string, tolMm = 10) => checkMeasuredDistance(
    profiles['intl-motorcycle'],
    { positionM: '3000', elevationM: '0' },
    { positionM: exitM, elevationM: '0' },
    '1609.344', // 1 mile = 1609.344 m exactly (NIST SP 811, appendix B)
    tolMm,
  )

  it('never accepts a distance shorter than nominal, even within the tolerance', () => {
    // Common practice, reasoned: a shorter distance timed as the nominal one inflates the speed.
    const short = mile('4609.343')
    expect(short.withinTolerance).toBe(false)
    expect(short.findings.map(f => [f.code, f.severity])).toEqual([['course.distance-off-survey', 'fail']])
    expect(short.findings[0]!.message).toMatch(/1\.0 mm shorter than the nominal/)
  })

  it('accepts a longer one within the survey tolerance only', () => {
    expect(mile('4609.354').withinTolerance).toBe(true) // 10 mm longer, tolerance 10 mm
    expect(mile('4609.355').withinTolerance).toBe(false) // 11 mm longer
    expect(mile('4609.344').findings).toEqual([])
  })

  it('fails a gradient over the profile limit', () => {
    // Source: FIM world records page (seen): gradient at most 1 %; 16.1 m rise over 1609.344 m is 1.0004 %.
    const steep = checkMeasuredDistance(
      profiles['intl-motorcycle'],
      { positionM: '0', elevationM: '0' },
      { positionM: '1609.344', elevationM: '16.1' },
      '1609.344',
      10,
    )
    expect(steep.findings.map(f => [f.code, f.severity])).toEqual([['course.gradient-over-limit', 'fail']])
  })
})

describe('timing', () => {
  it('subtracts integer ticks, never floats of time of day', () => {
    const tps = 10_000n
    const a = parseTimeOfDay('10:15:02.1234', tps)
    const b = parseTimeOfDay('10:15:07.9011', tps)
    expect(toFixed(segmentTime(a, b, tps), 4)).toBe('5.7777')
    expect(() => parseTimeOfDay('10:15:07.90111', tps)).toThrow(/resolves/)
    expect(() => segmentTime(b, a, tps)).toThrow()
  })

  it('cross-checks primary against backup within a tolerance', () => {
    expect(crossCheck(fromDecimal('5.767'), fromDecimal('5.7675'), fromDecimal('0.001')).ok).toBe(true)
    const bad = crossCheck(fromDecimal('5.767'), fromDecimal('5.770'), fromDecimal('0.001'))
    expect(bad.ok).toBe(false)
    expect(bad.findings[0]?.code).toBe('timing.cross-check')
  })

  it('finds the class from a measured mass where a profile defines classes', () => {
    const classes = [{ label: 'open', maxKg: null }, { label: 'up to 150 kg', maxKg: 150 }, { label: 'up to 300 kg', maxKg: 300 }]
    expect(massClass(classes, 150)?.label).toBe('up to 150 kg')
    expect(massClass(classes, 150.1)?.label).toBe('up to 300 kg')
    expect(massClass(classes, 900)?.label).toBe('open')
    expect(massClass(null, 100)).toBeNull()
  })
})

describe('checks at their edges, with their words', () => {
  it('a gradient exactly at the limit passes; over it, the finding names the gradient and the rule', () => {
    // FIM world records page (seen): at most 1 %. 1.0005 % is said to three decimals, rounded.
    expect(checkGradient(profiles['intl-motorcycle'], fromDecimal('1'))).toEqual([])
    expect(checkGradient(profiles['intl-motorcycle'], fromDecimal('-1'))).toEqual([])
    expect(checkGradient(profiles['intl-motorcycle'], fromDecimal('-1.0005'))).toEqual([{ code: 'course.gradient-over-limit', severity: 'fail',
      message: 'The measured distance has a gradient of 1.001 %, over the limit of 1 %.',
      rule: { name: 'Course gradient', value: 'at most 1 %', source: profiles['intl-motorcycle'].gradientMaxPercent.source, certainty: 'seen' } }])
    // No limit in the automobile profile: any gradient passes.
    expect(checkGradient(profiles['intl-automobile'], fromDecimal('5'))).toEqual([])
  })
  it('a gradient needs a positive horizontal distance', () => {
    expect(() => gradientPercent(q(0n), q(1n), q(0n))).toThrow('horizontal distance must be positive')
    expect(() => gradientPercent(q(0n), q(1n), q(-5n))).toThrow(RangeError)
    expect(toFixed(gradientPercent(q(100n), q(99n), q(1000n)), 3)).toBe('-0.100')
  })
  it('primary and backup agree at exactly the tolerance, and a finding names both figures beyond it', () => {
    expect(crossCheck(fromDecimal('10.000'), fromDecimal('10.002'), fromDecimal('0.002'))).toMatchObject({ ok: true, findings: [] })
    expect(crossCheck(fromDecimal('10.000'), fromDecimal('10.0021'), fromDecimal('0.002')).findings).toEqual([{ code: 'timing.cross-check', severity: 'fail',
      message: 'Primary and backup timing differ by 0.002100 s, more than the tolerance of 0.002000 s. The timekeeper must resolve it in writing.' }])
    expect(toFixed(crossCheck(fromDecimal('10.0021'), fromDecimal('10.000'), fromDecimal('0.002')).differenceS, 4)).toBe('0.0021')
  })
  it('puts a mass of 0 in no class, and a mass at a class\'s limit in that class', () => {
    const classes = [{ label: 'Open', maxKg: null }, { label: 'Light', maxKg: 300 }]
    expect(massClass(classes, 0)).toBeNull()
    expect(massClass(classes, 300)?.label).toBe('Light')
    expect(massClass(classes, 300.001)?.label).toBe('Open')
    expect(massClass(null, 100)).toBeNull()
  })
  it('gives an exact zero for a wind straight across (no float residue)', () => {
    expect(windComponents(5, 90, 0)).toEqual({ headMs: 0, crossMs: 5 })
    expect(windComponents(5, 0, 90)).toEqual({ headMs: 0, crossMs: -5 })
  })
})
