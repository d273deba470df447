import { div, fromDecimal, mul, q, toNumber, type Q } from './exact'

/** 1 mile = 1609.344 m exactly: international yard and pound agreement of 1959; NIST SP 811, appendix B. */
export const METRES_PER_MILE = q(1609344n, 1000n)
export const METRES_PER_KM = q(1000n)
/** 1 km/h = 1000 m / 3600 s = 5/18 m/s (definition of the units). */
export const MS_PER_KMH = q(5n, 18n)
/** 1 mph = 0.44704 m/s exactly, from the 1959 mile and the second; NIST SP 811, appendix B. */
export const MS_PER_MPH = q(44704n, 100000n)

export type LengthUnit = 'm' | 'km' | 'mile'
export type SpeedUnit = 'm/s' | 'km/h' | 'mph'

const METRES: Record<LengthUnit, Q> = { m: q(1n), km: METRES_PER_KM, mile: METRES_PER_MILE }
const MS: Record<SpeedUnit, Q> = { 'm/s': q(1n), 'km/h': MS_PER_KMH, 'mph': MS_PER_MPH }

export const toMetres = (value: Q, unit: LengthUnit): Q => mul(value, METRES[unit])
export const fromMetres = (metres: Q, unit: LengthUnit): Q => div(metres, METRES[unit])

export const convertSpeed = (value: Q, from: SpeedUnit, to: SpeedUnit): Q => div(mul(value, MS[from]), MS[to])
export const msToKmh = (v: Q) => convertSpeed(v, 'm/s', 'km/h')
export const msToMph = (v: Q) => convertSpeed(v, 'm/s', 'mph')
export const kmhToMph = (v: Q) => convertSpeed(v, 'km/h', 'mph')
export const mphToKmh = (v: Q) => convertSpeed(v, 'mph', 'km/h')

/** A published speed (an exact decimal in its unit) in m/s, to compare records of different units. */
export const publishedInMs = (r: { speed: string, unit: SpeedUnit }) =>
  convertSpeed(fromDecimal(r.speed), r.unit, 'm/s')

/** For display only (charts, gauges): never for a published figure. */
export const speedAsNumber = (v: Q, unit: SpeedUnit) => toNumber(convertSpeed(v, 'm/s', unit))
