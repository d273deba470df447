import { cmp, div, fromDecimal, mul, q } from './exact'
import { convertSpeed } from './units'

/**
 * The fastest a wheeled land vehicle has gone, two-way mean over the flying mile: 1227.985 km/h (763.035 mph),
 * 15 October 1997, ratified by the FIA (published record). A time that gives more is almost surely a typing slip.
 */
export const OUTRIGHT_RECORD_KMH = '1227.985'
/** An hour over a measured distance: no record attempt takes that long; almost surely a slip too. */
const LONGEST_S = 3600

/** A plain warning for a time that cannot be a record run over the distance, else null. Not a refusal. */
export function implausibleTime(distanceM: string, elapsedS: string): string | null {
  if (/^[+-]?\d*\.?\d+e[+-]?\d+$/i.test(elapsedS.trim())) {
    return 'Write the time as plain digits in seconds (such as 14.5000), not in exponent form.'
  }
  let d, t
  try {
    d = fromDecimal(distanceM)
    t = fromDecimal(elapsedS)
  }
  catch {
    return null
  }
  if (t.n <= 0n || d.n <= 0n) return null
  if (cmp(t, q(LONGEST_S)) > 0) {
    return `More than an hour over ${distanceM} m: check the time (seconds, not hundredths or minutes).`
  }
  const kmh = convertSpeed(div(d, t), 'm/s', 'km/h')
  if (cmp(kmh, fromDecimal(OUTRIGHT_RECORD_KMH)) > 0) {
    return `Faster than any machine has gone on land (${OUTRIGHT_RECORD_KMH} km/h, the outright record): `
      + 'check the time.'
  }
  return null
}

/** A speed typed in one unit, converted exactly to the other and given back with the same decimals. */
export function convertTyped(text: string, from: 'km/h' | 'mph', to: 'km/h' | 'mph'): string | null {
  const t = text.trim()
  if (!/^\d+(\.\d+)?$/.test(t)) return null
  const decimals = t.includes('.') ? t.split('.')[1]!.length : 0
  const v = convertSpeed(fromDecimal(t), from, to)
  // Rounded half up at the typed decimals: a conversion, not a result (results are never rounded up).
  const scale = 10n ** BigInt(decimals)
  const scaled = mul(v, q(scale))
  const whole = (scaled.n * 2n + scaled.d) / (2n * scaled.d)
  const s = whole.toString().padStart(decimals + 1, '0')
  return decimals ? `${s.slice(0, -decimals)}.${s.slice(-decimals)}` : s
}
