import { describe, expect, it } from 'vitest'
import { clockOff, clockOffset, CLOCK_WARN_MS } from '#shared/rules/clock'
import { readTypedTime } from '#shared/rules/timing'

describe('a device clock against the server\'s', () => {
  // RFC 5905, section 8: offset θ = ((T2 − T1) + (T3 − T4)) / 2; with one server stamp (T2 = T3 = S) it is
  // S − (T1 + T4) / 2, within ± half the round trip.
  it('is the server\'s stamp less the midpoint of the round trip', () => {
    expect(clockOffset({ sentMs: 0, receivedMs: 1000, serverMs: 1500 })).toEqual({ offsetMs: 1000, uncertaintyMs: 500 })
    // A device ahead of the server by 5 min reads a negative offset.
    expect(clockOffset({ sentMs: 300_100, receivedMs: 300_140, serverMs: 120 }).offsetMs).toBe(-300_000)
    expect(() => clockOffset({ sentMs: 10, receivedMs: 5, serverMs: 0 })).toThrow(RangeError)
  })

  it('warns only beyond 2 s even at the edge of what one round trip can tell', () => {
    expect(CLOCK_WARN_MS).toBe(2000)
    expect(clockOff({ offsetMs: 2400, uncertaintyMs: 300 })).toBe(true)
    expect(clockOff({ offsetMs: -2400, uncertaintyMs: 300 })).toBe(true)
    // 2.2 s ± 0.3 s might be 1.9 s: not warned.
    expect(clockOff({ offsetMs: 2200, uncertaintyMs: 300 })).toBe(false)
  })
})

describe('a time typed without separators on a phone keypad', () => {
  // Common practice: timing slips give hh:mm:ss.ffff; a number keypad has no colon, so the digits are read
  // as hhmmss with the fraction after the point (or a comma, the decimal sign of many locales).
  it('reads hhmmss.ffff and says how it was read', () => {
    expect(readTypedTime('182440.1000')).toEqual({ time: '18:24:40.1000', readAs: '182440.1000 read as 18:24:40.1000' })
    expect(readTypedTime('92440,5')).toEqual({ time: '09:24:40.5', readAs: '92440,5 read as 09:24:40.5' })
    expect(readTypedTime('18:24:40,25')).toEqual({ time: '18:24:40.25', readAs: null })
    expect(readTypedTime(' 18:24:40.1 ')).toEqual({ time: '18:24:40.1', readAs: null })
    expect(readTypedTime('1824')).toEqual({ time: '1824', readAs: null })
  })
})
