import { describe, expect, it } from 'vitest'
import { formatTimeOfDay, parseTimeOfDay, readTypedTime, segmentTime, speed, TIME_OF_DAY, TIME_OF_DAY_ERROR } from '#shared/rules/timing'
import { clockOff, clockOffset } from '#shared/rules/clock'
import { fromDecimal, q, toFixed } from '#shared/rules/exact'
import { convertSpeed, msToMph, kmhToMph, mphToKmh, publishedInMs, speedAsNumber } from '#shared/rules/units'

// Times of day as ISO 8601 writes them (hh:mm:ss[.fraction], 00:00:00 to 23:59:59.999…), counted in the timing
// system's ticks (1000 ticks per second = 1/1000 s). Every edge of the range, one unit inside and one outside.
describe('a time of day typed → ticks', () => {
  it.each([
    ['00:00:00', 1000n, 0n],
    ['00:00:00.001', 1000n, 1n],
    ['23:59:59.999', 1000n, 86_399_999n],
    ['9:05:03.5', 1000n, 32_703_500n], // 9 × 3600 + 5 × 60 + 3.5 = 32 703.5 s
    [' 10:00:00.0000 ', 10_000n, 360_000_000n], // spaces around are not part of it
    ['10:00:00', 1n, 36_000n],
    ['12:34:56.78', 100n, 4_529_678n],
  ] as const)('%j at %i per second → %i', (text, tps, ticks) => {
    expect(parseTimeOfDay(text, tps)).toBe(ticks)
  })

  it.each([
    ['24:00:00', 'time of day out of range: 24:00:00'],
    ['23:60:00', 'time of day out of range: 23:60:00'],
    ['23:59:60', 'time of day out of range: 23:59:60'],
    ['10:00:00.0001', 'more decimals than the timing system resolves: 10:00:00.0001'],
  ] as const)('%j is refused: %s', (text, message) => {
    expect(() => parseTimeOfDay(text, 1000n)).toThrow(RangeError)
    expect(() => parseTimeOfDay(text, 1000n)).toThrow(message)
  })

  it.each(['x10:00:00', '10:00:00x', '10:00:00.', '10:00', '100:00:00', '10:0:00', '', '10.00.00'])('%j is not a time of day', (text) => {
    expect(() => parseTimeOfDay(text, 1000n)).toThrow(SyntaxError)
    expect(() => parseTimeOfDay(text, 1000n)).toThrow(`not a time of day (HH:MM:SS.fff): ${JSON.stringify(text)}`)
  })
})

describe('ticks → a time of day, with the system\'s decimals', () => {
  it.each([
    [0n, 1000n, '00:00:00.000'],
    [86_399_999n, 1000n, '23:59:59.999'],
    [32_703_500n, 1000n, '09:05:03.500'],
    [360_000_007n, 10_000n, '10:00:00.0007'],
    [36_000n, 1n, '10:00:00'],
    [4_529_678n, 100n, '12:34:56.78'],
  ] as const)('%i at %i per second → %s', (ticks, tps, text) => {
    expect(formatTimeOfDay(ticks, tps)).toBe(text)
    expect(parseTimeOfDay(text, tps)).toBe(ticks)
  })
})

describe('segment times and speeds', () => {
  it('subtracts the entry from the exit, exactly, and refuses an exit not after the entry', () => {
    expect(toFixed(segmentTime(1000n, 10_001n, 1000n), 3)).toBe('9.001')
    expect(toFixed(segmentTime(0n, 1n, 1000n), 3)).toBe('0.001')
    expect(() => segmentTime(5n, 5n, 1000n)).toThrow('the exit trap must be broken after the entry trap')
    expect(() => segmentTime(6n, 5n, 1000n)).toThrow(RangeError)
  })
  it('is distance over time, for a positive time only', () => {
    // 1000 m in 9 s = 111.111… m/s = 400 km/h exactly.
    expect(toFixed(convertSpeed(speed(q(1000n), q(9n)), 'm/s', 'km/h'), 9)).toBe('400.000000000')
    expect(() => speed(q(1000n), q(0n))).toThrow('time must be positive')
    expect(() => speed(q(1000n), q(-1n))).toThrow(RangeError)
    expect(toFixed(speed(q(1000n), fromDecimal('0.001')), 0)).toBe('1000000')
  })
})

describe('speed units (1 mph = 0.44704 m/s, 1 km/h = 5/18 m/s exactly; NIST SP 811, appendix B)', () => {
  it('converts exactly between them', () => {
    expect(toFixed(msToMph(q(44704n, 1000n)), 9)).toBe('100.000000000') // 44.704 m/s = 100 mph
    expect(toFixed(mphToKmh(q(100n)), 6)).toBe('160.934400')
    expect(toFixed(kmhToMph(fromDecimal('160.9344')), 6)).toBe('100.000000')
    expect(toFixed(publishedInMs({ speed: '360', unit: 'km/h' }), 9)).toBe('100.000000000')
    expect(toFixed(publishedInMs({ speed: '100', unit: 'mph' }), 5)).toBe('44.70400')
    expect(toFixed(publishedInMs({ speed: '7', unit: 'm/s' }), 0)).toBe('7')
    expect(speedAsNumber(q(100n), 'km/h')).toBe(360)
    expect(speedAsNumber(q(44704n, 1000n), 'mph')).toBeCloseTo(100, 12)
  })
})

describe('readTypedTime: a time typed on a number keypad, with no colon', () => {
  it.each([
    ['182440.1000', '18:24:40.1000', '182440.1000 read as 18:24:40.1000'],
    ['182440,1000', '18:24:40.1000', '182440,1000 read as 18:24:40.1000'],
    ['92440.5', '09:24:40.5', '92440.5 read as 09:24:40.5'],
    ['092440', '09:24:40', '092440 read as 09:24:40'],
    [' 182440.1 ', '18:24:40.1', '182440.1 read as 18:24:40.1'],
  ] as const)('%j → %s', (typed, time, readAs) => {
    expect(readTypedTime(typed)).toEqual({ time, readAs })
  })
  it.each([
    ['18:24:40.1000', '18:24:40.1000'],
    ['18:24:40,1000', '18:24:40.1000'], // a decimal comma in a time with colons
    ['1824', '1824'], // too few digits: given back for the form to refuse
    ['1824401', '1824401'], // too many
    ['182440.1234567', '182440.1234567'], // more than 6 decimals
    ['a182440', 'a182440'],
    ['182440x', '182440x'],
    ['x18:24:40,1', 'x18:24:40,1'],
    ['18:24:40,1x', '18:24:40,1x'],
  ] as const)('%j is given back as %j, not read', (typed, time) => {
    expect(readTypedTime(typed)).toEqual({ time, readAs: null })
  })
})

describe('a device clock against the server\'s, at its edges (RFC 5905, section 8)', () => {
  it('takes an answer received at the instant it was sent, and refuses one before', () => {
    expect(clockOffset({ sentMs: 100, receivedMs: 100, serverMs: 600 })).toEqual({ offsetMs: 500, uncertaintyMs: 0 })
    expect(() => clockOffset({ sentMs: 100, receivedMs: 99, serverMs: 600 })).toThrow('the answer came before the request was sent')
    // θ = S − (T1 + T4) / 2 = 1000 − (200 + 300) / 2 = 750, within ± (300 − 200) / 2 = 50.
    expect(clockOffset({ sentMs: 200, receivedMs: 300, serverMs: 1000 })).toEqual({ offsetMs: 750, uncertaintyMs: 50 })
  })
  it('warns beyond 2 s even at the edge of the uncertainty; exactly 2 s is not beyond', () => {
    expect(clockOff({ offsetMs: 2300, uncertaintyMs: 300 })).toBe(false)
    expect(clockOff({ offsetMs: 2301, uncertaintyMs: 300 })).toBe(true)
    expect(clockOff({ offsetMs: -2301, uncertaintyMs: 300 })).toBe(true)
    expect(clockOff({ offsetMs: 2000, uncertaintyMs: 0 })).toBe(false)
    expect(clockOff({ offsetMs: 2001, uncertaintyMs: 0 })).toBe(true)
  })
})

describe('the time-of-day pattern the run sheet\'s cells and the schemas share', () => {
  it('takes H:MM:SS or HH:MM:SS with up to six decimals, and nothing else', () => {
    for (const t of ['9:05:03', '09:05:03', '23:59:59.999999', '10:00:00.1']) expect(TIME_OF_DAY.test(t), t).toBe(true)
    for (const t of ['10:00', '10:00:00.', '10:00:00.1234567', ' 10:00:00', 'x10:00:00', '10:00:00x', '100:00:00']) expect(TIME_OF_DAY.test(t), t).toBe(false)
    expect(TIME_OF_DAY_ERROR).toBe('must be a time of day, HH:MM:SS.fff')
  })
})
