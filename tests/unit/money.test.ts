import { describe, expect, it } from 'vitest'
import { CURRENCIES, currencyDecimals, formatMoney, toMinor } from '#shared/utils/money'

// Minor units from ISO 4217's published list of currency codes ("Minor unit" column): JPY 0, KRW 0,
// ISK 0, EUR 2, USD 2, GBP 2, CHF 2, BHD 3, KWD 3, JOD 3, OMR 3, TND 3.
describe('the decimals of a currency (ISO 4217 minor unit)', () => {
  it.each([
    ['jpy', 0], ['krw', 0], ['isk', 0], ['clp', 0], ['vnd', 0],
    ['eur', 2], ['usd', 2], ['gbp', 2], ['chf', 2], ['sek', 2],
    ['bhd', 3], ['kwd', 3], ['jod', 3], ['omr', 3], ['tnd', 3],
  ] as const)('%s has %i', (code, decimals) => {
    expect(currencyDecimals(code)).toBe(decimals)
    expect(currencyDecimals(code.toUpperCase())).toBe(decimals)
  })

  it('every currency offered on the fees form parses an amount (a JPY fee once threw a SyntaxError)', () => {
    for (const c of CURRENCIES) expect(() => toMinor('1', c), c).not.toThrow()
    expect(CURRENCIES.map(c => toMinor('1', c))).toEqual(CURRENCIES.map(c => 10 ** currencyDecimals(c)))
  })
})

describe('an amount typed → integer minor units', () => {
  it.each([
    // Two decimals (EUR, USD): 1 unit = 100 cents (ISO 4217).
    ['150', 'eur', 15000], ['150.5', 'eur', 15050], ['150.50', 'eur', 15050], ['150,05', 'eur', 15005],
    ['0', 'usd', 0], ['0.01', 'usd', 1], [' 7.25 ', 'usd', 725], ['999999999.99', 'usd', 99999999999],
    // None (JPY): 1 yen is the smallest unit.
    ['1500', 'jpy', 1500], ['0', 'jpy', 0], ['1', 'JPY', 1],
    // Three (BHD, KWD): 1 dinar = 1000 fils.
    ['1.5', 'bhd', 1500], ['1.005', 'bhd', 1005], ['12', 'kwd', 12000], ['0.001', 'kwd', 1], ['3,25', 'kwd', 3250],
  ] as const)('%j %s → %i', (text, currency, minor) => {
    const got = toMinor(text, currency)
    expect(got).toBe(minor)
    expect(Number.isInteger(got)).toBe(true)
  })

  it.each([
    ['-1', 'eur'], ['−1', 'eur'], ['-0.01', 'usd'], // negatives refused
    ['150.505', 'eur'], ['0.001', 'usd'], // a third decimal in a two-decimal currency
    ['1.5', 'jpy'], ['1,500', 'jpy'], ['1.', 'jpy'], // any decimals in a currency that has none
    ['1.0005', 'bhd'], // a fourth decimal in a three-decimal currency
    ['', 'eur'], ['.5', 'eur'], ['1.', 'eur'], ['1e3', 'eur'], ['0x10', 'eur'], ['1 000', 'eur'], ['abc', 'eur'],
    ['1234567890', 'eur'], // more than 9 whole digits
  ] as const)('%j in %s is refused', (text, currency) => {
    expect(toMinor(text, currency)).toBeNull()
  })

  it('adds no binary-float error: 0.29 EUR is 29 cents, where 0.29 × 100 in floating point is 28.999999999999996', () => {
    // IEEE 754 double: 0.29 * 100 === 28.999999999999996 (any JavaScript engine).
    expect(0.29 * 100).not.toBe(29)
    expect(toMinor('0.29', 'eur')).toBe(29)
    expect(toMinor('1.13', 'usd')).toBe(113) // 1.13 * 100 === 112.99999999999999
  })
})

describe('minor units → the amount shown, always with its currency', () => {
  it.each([
    [15050, 'eur', '150.50 EUR'], [5, 'eur', '0.05 EUR'], [0, 'usd', '0.00 USD'], [100, 'usd', '1.00 USD'],
    [123456789, 'gbp', '1,234,567.89 GBP'], [-1800, 'eur', '−18.00 EUR'],
    [1500, 'jpy', '1,500 JPY'], [0, 'jpy', '0 JPY'], [-7, 'jpy', '−7 JPY'],
    [1005, 'bhd', '1.005 BHD'], [1, 'kwd', '0.001 KWD'], [12000, 'kwd', '12.000 KWD'],
  ] as const)('%i %s → %s', (minor, currency, shown) => {
    expect(formatMoney(minor, currency)).toBe(shown)
  })

  it('reads back what it shows, in every currency offered', () => {
    for (const c of [...CURRENCIES, 'bhd', 'kwd']) {
      for (const minor of [0, 1, 9, 10, 99, 100, 101, 12345, 99999999]) {
        const text = formatMoney(minor, c).split(' ')[0]!.replace(/,/g, '')
        expect(toMinor(text, c), `${minor} ${c}`).toBe(minor)
      }
    }
  })
})
