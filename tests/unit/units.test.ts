import { unit } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { fromDecimal, q, toNumber } from '#shared/rules/exact'
import { convertSpeed, fromMetres, METRES_PER_MILE, MS_PER_MPH, toMetres } from '#shared/rules/units'

describe('units', () => {
  it('defines the mile as 1609.344 m exactly', () => {
    // Source: international yard and pound agreement of 1959; NIST SP 811, appendix B.
    expect(METRES_PER_MILE).toEqual(fromDecimal('1609.344'))
    // Source: the mathjs unit system (general-purpose reference library from npm).
    expect(toNumber(toMetres(q(1n), 'mile'))).toBe(unit(1, 'mi').toNumber('m'))
  })

  it('defines 1 mph as 0.44704 m/s exactly', () => {
    // Source: NIST SP 811, appendix B (mile per hour = 0.44704 m/s exactly).
    expect(MS_PER_MPH).toEqual(fromDecimal('0.44704'))
  })

  it.each([
    [100, 'km/h', 'mph'],
    [250, 'mph', 'km/h'],
    [1, 'm/s', 'km/h'],
    [400, 'km/h', 'm/s'],
    [633.468, 'mph', 'm/s'],
  ] as const)('converts %s %s to %s like mathjs', (value, from, to) => {
    // Source: the mathjs unit system (km/h, mi/h and m/s).
    const name = (u: string) => (u === 'mph' ? 'mi/h' : u)
    const expected = unit(value, name(from)).toNumber(name(to))
    expect(toNumber(convertSpeed(fromDecimal(String(value)), from, to))).toBeCloseTo(expected, 9)
  })

  it('converts lengths both ways like mathjs', () => {
    // Source: the mathjs unit system.
    expect(toNumber(fromMetres(q(5000n), 'mile'))).toBeCloseTo(unit(5000, 'm').toNumber('mi'), 12)
    expect(toNumber(toMetres(q(3n), 'km'))).toBe(unit(3, 'km').toNumber('m'))
  })
})
