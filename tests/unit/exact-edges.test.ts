import { describe, expect, it } from 'vitest'
import { fraction, type Fraction } from 'mathjs'
import { abs, add, ceilTo, cmp, decimalsOf, div, floorTo, fromDecimal, fromInput, fromNumber, isPositive, max,
  MAX_DECIMAL_CHARS, min, mul, q, roundTo, sub, toExactDecimal, toFixed, toNumber, type Q } from '#shared/rules/exact'

// Exact rationals against mathjs's Fraction (a general-purpose reference library): every operation, signs, and the
// edges of parsing, rounding and printing.
const asFraction = (a: Q): Fraction => fraction(`${a.n}/${a.d}`)
const same = (a: Q, f: Fraction) => expect(`${a.n}/${a.d}`).toBe(`${BigInt(f.s) * BigInt(f.n)}/${BigInt(f.d)}`)

describe('rational arithmetic against mathjs', () => {
  const values = ['-7.5', '-1', '-0.125', '0', '0.001', '1', '2.5', '1609.344', '1/3']
  const parse = (v: string) => (v.includes('/') ? q(BigInt(v.split('/')[0]!), BigInt(v.split('/')[1]!)) : fromDecimal(v))
  it('adds, subtracts, multiplies, divides and compares as mathjs does, signs included', () => {
    for (const x of values) {
      for (const y of values) {
        const [a, b, fa, fb] = [parse(x), parse(y), fraction(x), fraction(y)]
        same(add(a, b), fa.add(fb))
        same(sub(a, b), fa.sub(fb))
        same(mul(a, b), fa.mul(fb))
        if (!fb.equals(0)) same(div(a, b), fa.div(fb))
        expect(cmp(a, b), `${x} vs ${y}`).toBe(fa.compare(fb))
        expect(min(a, b)).toEqual(fa.compare(fb) <= 0 ? a : b)
        expect(max(a, b)).toEqual(fa.compare(fb) >= 0 ? a : b)
      }
      same(abs(parse(x)), fraction(x).abs())
      expect(isPositive(parse(x))).toBe(fraction(x).compare(0) > 0)
    }
  })
  it('keeps the denominator positive and the fraction reduced; refuses a zero denominator', () => {
    expect(q(3n, -6n)).toEqual({ n: -1n, d: 2n })
    expect(q(-3n, -6n)).toEqual({ n: 1n, d: 2n })
    expect(q(0n, -5n)).toEqual({ n: 0n, d: 1n })
    expect(q(-4n, 2n)).toEqual({ n: -2n, d: 1n })
    expect(() => q(1n, 0n)).toThrow('division by zero')
    expect(() => div(q(1n), q(0n))).toThrow('division by zero')
    expect(asFraction(q(10n, 4n)).toFraction()).toBe('5/2')
  })
  it('picks the first of two equal values for min and max alike', () => {
    const [a, b] = [q(1n, 2n), q(2n, 4n)]
    expect(min(a, b)).toBe(a)
    expect(max(a, b)).toBe(a)
  })
})

describe('parsing decimals', () => {
  it.each([
    ['5.767', '5767/1000'], ['-5.767', '-5767/1000'], ['+2', '2/1'], ['.5', '1/2'], ['-.5', '-1/2'], ['3.', '3/1'],
    ['1e3', '1000/1'], ['1E-3', '1/1000'], ['2.5e+2', '250/1'], ['-.25e1', '-5/2'], ['  7.25  ', '29/4'], ['0.000', '0/1'],
    ['1e30', `${10n ** 30n}/1`], ['1e-30', `1/${10n ** 30n}`],
  ] as const)('%j → %s', (text, value) => {
    const a = fromDecimal(text)
    expect(`${a.n}/${a.d}`).toBe(value)
  })
  it.each(['', ' ', 'abc', '1.2.3', '1,5', '--1', '1e', 'e3', '0x10', '1 000', 'Infinity', 'NaN'])('%j is not a decimal', (text) => {
    expect(() => fromDecimal(text)).toThrow(`not a decimal number: ${JSON.stringify(text)}`)
  })
  it('refuses an exponent beyond 30 either way, and a text beyond 40 characters (80 with spaces around)', () => {
    expect(() => fromDecimal('1e31')).toThrow('exponent out of range')
    expect(() => fromDecimal('1e-31')).toThrow('exponent out of range')
    const forty = `1.${'0'.repeat(MAX_DECIMAL_CHARS - 2)}`
    expect(forty).toHaveLength(40)
    expect(fromDecimal(forty)).toEqual(q(1n))
    expect(() => fromDecimal(`${forty}0`)).toThrow('a decimal of at most 40 characters')
    // Spaces around are trimmed first, within twice the limit in all.
    expect(fromDecimal(`${' '.repeat(20)}${forty}${' '.repeat(20)}`)).toEqual(q(1n))
    expect(() => fromDecimal(`${' '.repeat(21)}${forty}${' '.repeat(20)}`)).toThrow(RangeError)
  })
  it('takes a JavaScript number at its shortest spelling, never its binary value', () => {
    expect(fromNumber(0.1)).toEqual(q(1n, 10n))
    expect(fromNumber(-2.5)).toEqual(q(-5n, 2n))
    expect(fromNumber(1e-7)).toEqual(q(1n, 10_000_000n))
    expect(() => fromNumber(Infinity)).toThrow('not a finite number')
    expect(() => fromNumber(Number.NaN)).toThrow(RangeError)
    expect(fromInput(0.25)).toEqual(q(1n, 4n))
    expect(fromInput('0.25')).toEqual(q(1n, 4n))
  })
})

describe('truncating, rounding and printing', () => {
  it.each([
    ['2.5', 0, 'truncate', '2'], ['2.5', 0, 'round', '3'], ['-2.5', 0, 'round', '-3'], ['-2.5', 0, 'truncate', '-2'],
    ['2.4999', 0, 'round', '2'], ['-2.4999', 0, 'round', '-2'], ['0.0005', 3, 'round', '0.001'], ['0.0004999', 3, 'round', '0.000'],
    ['-0.0004', 3, 'round', '0.000'], ['-0.0004', 3, 'truncate', '0.000'], ['-0.0005', 3, 'round', '-0.001'],
    ['123.456789', 3, 'truncate', '123.456'], ['123.456789', 3, 'round', '123.457'], ['0.05', 1, 'round', '0.1'],
    ['7', 2, 'truncate', '7.00'], ['-7', 2, 'truncate', '-7.00'],
  ] as const)('%s at %i decimals, %s → %s', (text, k, mode, out) => {
    expect(toFixed(fromDecimal(text), k, mode)).toBe(out)
    expect(roundTo(fromDecimal(text), k, mode)).toEqual(fromDecimal(out))
  })
  it('truncates by default', () => {
    expect(toFixed(fromDecimal('1.999'), 2)).toBe('1.99')
  })
  it.each([
    ['1.234', 2, '1.23', '1.24'], ['-1.234', 2, '-1.24', '-1.23'], ['1.23', 2, '1.23', '1.23'], ['-1.23', 2, '-1.23', '-1.23'],
    ['0', 3, '0', '0'], ['-0.0001', 3, '-0.001', '0'],
  ] as const)('floor and ceiling of %s at %i decimals: %s and %s', (text, k, floor, ceil) => {
    expect(floorTo(fromDecimal(text), k)).toEqual(fromDecimal(floor))
    expect(ceilTo(fromDecimal(text), k)).toEqual(fromDecimal(ceil))
  })
  it('spells a value exactly, or says it cannot within the places allowed', () => {
    expect(toExactDecimal(fromDecimal('5.7670'), 6)).toBe('5.767')
    expect(toExactDecimal(fromDecimal('5.767'), 3)).toBe('5.767')
    expect(toExactDecimal(fromDecimal('5.767'), 2)).toBeNull()
    expect(toExactDecimal(q(1n, 3n), 30)).toBeNull()
    expect(toExactDecimal(q(-12n), 0)).toBe('-12')
  })
  it.each([['5.7670', 4], ['5', 0], ['1e-3', 3], ['1.5e-2', 3], ['1.25e1', 1], ['1.5e3', 0], [' 2.50 ', 2], [0.125, 3]] as const)(
    'decimals of %j: %i', (text, k) => {
      expect(decimalsOf(text)).toBe(k)
    })
  it('gives a number for display close to the exact value', () => {
    expect(toNumber(q(1n, 3n))).toBeCloseTo(1 / 3, 15)
    expect(toNumber(q(-7n, 2n))).toBe(-3.5)
    expect(toNumber(fromDecimal('1609.344'))).toBe(1609.344)
  })
})

describe('decimal places of a spelling, at its edges', () => {
  it.each([[' 1e-3 ', 3], ['1.5e-12', 13], ['2.5E-10', 11], ['7e+2', 0]] as const)('%j: %i', (text, k) => {
    expect(decimalsOf(text)).toBe(k)
  })
})
