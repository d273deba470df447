import { describe, expect, it } from 'vitest'
import { fromDecimal, fromNumber, q, toFixed } from '#shared/rules/exact'

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
    // Common practice of published speed figures: truncation at the last decimal (see domain notes).
    expect(toFixed(q(6429719n, 10000n), 3, 'truncate')).toBe('642.971')
    expect(toFixed(q(6429719n, 10000n), 3, 'round')).toBe('642.972')
    expect(toFixed(q(-15n, 10n), 0, 'round')).toBe('-2')
    expect(toFixed(q(5n, 1000n), 2, 'truncate')).toBe('0.00')
    expect(toFixed(q(7n), 2)).toBe('7.00')
  })

  it('lands exactly on an exactly representable speed where floats fall a hair short', () => {
    // 0.1 + 0.2 in floats is 0.30000000000000004; 0.3 − 0.1 is 0.19999999999999998, which a float
    // truncation prints as 0.199. Exact arithmetic keeps 0.200.
    expect(Math.trunc((0.3 - 0.1) * 1000) / 1000).toBe(0.199)
    const x = fromDecimal('0.3')
    const y = fromDecimal('0.1')
    expect(toFixed(q(x.n * y.d - y.n * x.d, x.d * y.d), 3)).toBe('0.200')
  })
})
