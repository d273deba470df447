/**
 * Money as integer minor units (cents), never floats. The decimals of a currency follow ISO 4217; the
 * zero-decimal ones used here are listed (the payment provider's list of zero-decimal currencies agrees).
 */
export const CURRENCIES = ['eur', 'usd', 'gbp', 'chf', 'aud', 'cad', 'nzd', 'sek', 'nok', 'dkk', 'jpy'] as const
export type Currency = (typeof CURRENCIES)[number]
const ZERO_DECIMAL = new Set(['jpy'])
export const currencyDecimals = (c: string) => (ZERO_DECIMAL.has(c) ? 0 : 2)

/** "150", "150.5" or "150.50" in a currency → 15050 minor units; null when it is not such an amount. */
export function toMinor(text: string, currency: string): number | null {
  const d = currencyDecimals(currency)
  const m = new RegExp(`^(\\d{1,9})(?:[.,](\\d{1,${d}}))?$`).exec(text.trim())
  if (!m || (d === 0 && m[2])) return null
  return Number(m[1]) * 10 ** d + Number((m[2] ?? '').padEnd(d, '0') || 0)
}

/** 15050 minor units of eur → "150.00 EUR": the amount always with its currency. */
export function formatMoney(minor: number, currency: string) {
  const d = currencyDecimals(currency)
  const sign = minor < 0 ? '−' : ''
  const abs = Math.abs(minor)
  const whole = Math.floor(abs / 10 ** d)
  const frac = d ? `.${String(abs % 10 ** d).padStart(d, '0')}` : ''
  return `${sign}${whole.toLocaleString('en-GB')}${frac} ${currency.toUpperCase()}`
}
