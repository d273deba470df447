/**
 * Money as integer minor units (cents), never floats. The decimals of a currency are its minor unit in
 * ISO 4217 (the published list of codes, "Minor unit" column); the payment provider's lists of zero- and
 * three-decimal currencies agree for the codes offered here.
 */
export const CURRENCIES = ['eur', 'usd', 'gbp', 'chf', 'aud', 'cad', 'nzd', 'sek', 'nok', 'dkk', 'jpy'] as const
export type Currency = (typeof CURRENCIES)[number]

/** ISO 4217 currencies whose minor unit is not 2: none (0) or thousandths (3). Every other code has 2. */
const MINOR_UNIT: Readonly<Record<string, 0 | 3>> = {
  bif: 0, clp: 0, djf: 0, gnf: 0, isk: 0, jpy: 0, kmf: 0, krw: 0, pyg: 0, rwf: 0, ugx: 0, vnd: 0, vuv: 0,
  xaf: 0, xof: 0, xpf: 0,
  bhd: 3, iqd: 3, jod: 3, kwd: 3, lyd: 3, omr: 3, tnd: 3,
}
/** How many decimals a currency's amounts have (its ISO 4217 minor unit); the code in either case. */
export const currencyDecimals = (c: string): number => MINOR_UNIT[c.toLowerCase()] ?? 2

/**
 * "150", "150.5" or "150.50" in a currency → 15050 minor units; "150,50" with a decimal comma too. Null
 * when it is not such an amount: negative, more decimals than the currency has, any decimals in a
 * currency that has none, or more than 9 whole digits. The digits are joined as text: no float is made.
 */
export function toMinor(text: string, currency: string): number | null {
  const d = currencyDecimals(currency)
  const fraction = d === 0 ? '' : `(?:[.,](\\d{1,${d}}))?`
  const m = new RegExp(`^(\\d{1,9})${fraction}$`).exec(text.trim())
  if (!m) return null
  return Number(`${m[1]}${(m[2] ?? '').padEnd(d, '0')}`)
}

/** 15050 minor units of eur → "150.00 EUR": the amount always with its currency. */
export function formatMoney(minor: number, currency: string) {
  const d = currencyDecimals(currency)
  const sign = minor < 0 ? '−' : ''
  const digits = String(Math.abs(minor)).padStart(d + 1, '0')
  const whole = Number(digits.slice(0, digits.length - d))
  const frac = d ? `.${digits.slice(digits.length - d)}` : ''
  return `${sign}${whole.toLocaleString('en-GB')}${frac} ${currency.toUpperCase()}`
}
