import { describe, expect, it } from 'vitest'
import { convertTyped, implausibleTime } from '#shared/rules/plausible'

describe('a time that cannot be a record run gets a plain warning', () => {
  // The outright land speed record, 1227.985 km/h over the flying mile (FIA, 15 October 1997, published):
  // 1609.344 m ÷ (1227.985 ÷ 3.6) m/s = 5793.6384 ÷ 1227.985 = 4.7180042… s. A mile in 4.7180 s is faster
  // (1227.9860… km/h); in 4.7181 s it is not (1227.9600… km/h): the edge, a ten-thousandth of a second either side.
  it('warns above the outright record and not below it', () => {
    expect(implausibleTime('1609.344', '4.7170')).toContain('Faster than any machine has gone on land')
    expect(implausibleTime('1609.344', '4.7180')).toContain('Faster than any machine has gone on land')
    expect(implausibleTime('1609.344', '4.7181')).toBeNull()
    expect(implausibleTime('1609.344', '4.7190')).toBeNull()
    expect(implausibleTime('1609.344', '0.0001')).toContain('check the time')
    // The record itself over a kilometre: 1000 ÷ (1227.985 ÷ 3.6) = 2.93163… s; exactly 1227.985 km/h is not faster.
    expect(implausibleTime('1227.985', '3.6')).toBeNull()
    expect(implausibleTime('1227.986', '3.6')).toContain('Faster than any machine')
  })
  it('says nothing of a zero or negative time or distance, or of text that is not a number (the form says that)', () => {
    expect(implausibleTime('1000', '0')).toBeNull()
    expect(implausibleTime('0', '14.5')).toBeNull()
    expect(implausibleTime('1000', '-14.5')).toBeNull()
    expect(implausibleTime('1000', 'fast')).toBeNull()
  })
  it('warns of more than an hour, and of a time written in exponent form', () => {
    // An hour is 3600 s: exactly an hour is not more than an hour.
    expect(implausibleTime('1000', '3600')).toBeNull()
    expect(implausibleTime('1000', '3600.0001')).toContain('More than an hour')
    expect(implausibleTime('1000', '3600.1')).toContain('More than an hour')
    expect(implausibleTime('1000', '1e21')).toContain('not in exponent form')
    expect(implausibleTime('1000', '14.5')).toBeNull()
  })
})

describe('the unit switch converts the record typed', () => {
  // 1 mile = 1.609344 km exactly (NIST SP 811, appendix B): 400 km/h = 248.5484… mph; 250 mph = 402.336 km/h.
  it('converts exactly and keeps the decimals typed', () => {
    expect(convertTyped('400.000', 'km/h', 'mph')).toBe('248.548')
    expect(convertTyped('250', 'mph', 'km/h')).toBe('402')
    expect(convertTyped('250.000', 'mph', 'km/h')).toBe('402.336')
    expect(convertTyped('fast', 'mph', 'km/h')).toBeNull()
  })
})

describe('edges of the warnings and the unit switch', () => {
  const EXP = 'Write the time as plain digits in seconds (such as 14.5000), not in exponent form.'
  it('names every exponent form, signed, spaced or with a fraction, and nothing else', () => {
    for (const t of ['1e5', '+1e5', '-1e5', ' 1e5 ', '12.5e3', '1.25e3', '1e-3', '1E+2', '.5e1']) {
      expect(implausibleTime('1000', t), t).toBe(EXP)
    }
    // Not a number at all: said by the form, not here.
    for (const t of ['x1e5', '1e5x', 'e5', '1e']) expect(implausibleTime('1000', t), t).toBeNull()
  })
  it('converts a typed record with its spaces trimmed, small values with their zeros, and refuses anything else', () => {
    // 400 km/h = 248.548… mph, rounded at no decimals: 249; 0.001 mph = 0.001609344 km/h: 0.002.
    expect(convertTyped(' 400 ', 'km/h', 'mph')).toBe('249')
    expect(convertTyped('0.001', 'mph', 'km/h')).toBe('0.002')
    expect(convertTyped('0.1', 'km/h', 'mph')).toBe('0.1') // 0.0621… mph, rounded at one decimal
    for (const t of ['x400', '400x', '4e2', '-400', '400.', '.5']) expect(convertTyped(t, 'km/h', 'mph'), t).toBeNull()
  })
})
