import { describe, expect, it } from 'vitest'
import { div, fromDecimal, fromNumber, q, sub, toFixed } from '#shared/rules/exact'
import { msToKmh } from '#shared/rules/units'

describe('exact figures', () => {
  it('parses decimals exactly', () => {
    expect(fromDecimal('5.767')).toEqual(q(5767n, 1000n))
    expect(fromDecimal('1e-3')).toEqual(q(1n, 1000n))
    expect(fromDecimal('.5')).toEqual(q(1n, 2n))
    expect(fromNumber(0.1)).toEqual(q(1n, 10n))
    expect(() => fromDecimal('5,767')).toThrow()
    expect(() => fromNumber(Number.NaN)).toThrow()
  })

  it('truncates and rounds once at the end', () => {
    // Common practice of published speed figures: truncation at the last decimal; the 1983 result's 642.971 mph
    // (Royal Automobile Club, published) is 3600 / 5.599 = 642.9719… truncated, where rounding gives 642.972.
    expect(toFixed(q(6429719n, 10000n), 3, 'truncate')).toBe('642.971')
    expect(toFixed(q(6429719n, 10000n), 3, 'round')).toBe('642.972')
    expect(toFixed(q(-15n, 10n), 0, 'round')).toBe('-2')
    expect(toFixed(q(5n, 1000n), 2, 'truncate')).toBe('0.00')
    expect(toFixed(q(7n), 2)).toBe('7.00')
  })

  it('lands exactly on an exactly representable figure and truncates it to itself', () => {
    // Hand computation: 0.3 − 0.1 = 0.2 exactly, printed 0.200 at three decimals; and 1000 m in 2.5 s is
    // 400 m/s = 1440 km/h exactly, printed 1440.000 (no value a hair under it).
    expect(toFixed(sub(fromDecimal('0.3'), fromDecimal('0.1')), 3)).toBe('0.200')
    expect(toFixed(msToKmh(div(q(1000n), fromDecimal('2.5'))), 3)).toBe('1440.000')
  })
})

describe('bounded decimals', () => {
  it('refuses a decimal longer than 40 characters, or an exponent beyond 30, before any arithmetic', () => {
    // Common practice of input validation: a time of day at 1 µs needs 15 characters.
    expect(() => fromDecimal(`1.${'7'.repeat(39)}`)).toThrow(/at most 40 characters/)
    expect(fromDecimal(`1.${'7'.repeat(38)}`).d).toBe(10n ** 38n)
    expect(() => fromDecimal('1e31')).toThrow(/exponent/)
    expect(() => fromDecimal(`${' '.repeat(100)}1`)).toThrow(/at most 40 characters/)
  })
})
