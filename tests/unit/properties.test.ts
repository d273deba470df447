import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluateAttempt } from '#shared/rules/attempt'
import { add, cmp, div, fromDecimal, mul, q, roundTo } from '#shared/rules/exact'
import { profiles } from '#shared/rules/profiles'
import { convertSpeed, kmhToMph, mphToKmh } from '#shared/rules/units'

// Property tests with fast-check (general-purpose property-testing library from npm).
const ms = fc.integer({ min: 2_000, max: 120_000 }) // run times from 2 s to 120 s, in ms
const time = (x: number) => q(BigInt(x), 1000n)
const mile = fromDecimal('1609.344')

const pair = (t1: number, t2: number) => evaluateAttempt({
  profile: profiles['intl-motorcycle'],
  distanceM: mile,
  runs: [
    { direction: 'out', startedAtMs: 0, elapsedS: time(t1) },
    { direction: 'back', startedAtMs: 600_000, elapsedS: time(t2) },
  ],
})

describe('properties of the two-way result', () => {
  it('never exceeds the arithmetic mean of the two speeds (harmonic ≤ arithmetic mean)', () => {
    fc.assert(fc.property(ms, ms, (t1, t2) => {
      const r = pair(t1, t2)
      const arithmetic = div(add(r.runs[0]!.speedMs, r.runs[1]!.speedMs), q(2n))
      expect(cmp(r.result!.speedMs, arithmetic)).toBeLessThanOrEqual(0)
    }))
  })

  it('does not change when the runs are swapped', () => {
    fc.assert(fc.property(ms, ms, (t1, t2) => {
      expect(pair(t1, t2).result).toEqual(pair(t2, t1).result)
    }))
  })

  it('truncation never raises a figure', () => {
    fc.assert(fc.property(fc.bigInt({ min: 1n, max: 10n ** 15n }), fc.bigInt({ min: 1n, max: 10n ** 9n }), fc.integer({ min: 0, max: 6 }), (n, d, k) => {
      expect(cmp(roundTo(q(n, d), k, 'truncate'), q(n, d))).toBeLessThanOrEqual(0)
    }))
  })

  it('km/h to mph divides by 1.609344 exactly, and m/s to km/h multiplies by 3.6 exactly', () => {
    // Source: NIST SP 811, appendix B: 1 mi = 1609.344 m, 1 km/h = 1/3.6 m/s. The factors are written here,
    // not taken from the product, so a wrong factor in the product fails.
    fc.assert(fc.property(fc.integer({ min: 1, max: 2_000_000_000 }), (milli) => {
      const v = q(BigInt(milli), 1000n)
      expect(kmhToMph(v)).toEqual(div(v, fromDecimal('1.609344')))
      expect(mphToKmh(v)).toEqual(mul(v, fromDecimal('1.609344')))
      expect(convertSpeed(v, 'm/s', 'km/h')).toEqual(mul(v, fromDecimal('3.6')))
    }))
  })
})
