// Exact rational arithmetic on bigint, so that a figure is truncated once, at the end, and never
// lands a hair under an exactly representable value because of a float on the way.

export interface Q {
  readonly n: bigint
  readonly d: bigint // always > 0
}

export type Rounding = 'truncate' | 'round'

function gcd(a: bigint, b: bigint): bigint {
  if (a < 0n) a = -a
  if (b < 0n) b = -b
  while (b) [a, b] = [b, a % b]
  return a
}

export function q(n: bigint | number, d: bigint | number = 1n): Q {
  let nn = BigInt(n)
  let dd = BigInt(d)
  if (dd === 0n) throw new RangeError('division by zero')
  if (dd < 0n) {
    nn = -nn
    dd = -dd
  }
  const g = gcd(nn, dd) || 1n
  return { n: nn / g, d: dd / g }
}

export const ZERO = q(0n)
export const ONE = q(1n)

export const add = (a: Q, b: Q): Q => q(a.n * b.d + b.n * a.d, a.d * b.d)
export const sub = (a: Q, b: Q): Q => q(a.n * b.d - b.n * a.d, a.d * b.d)
export const mul = (a: Q, b: Q): Q => q(a.n * b.n, a.d * b.d)
export const div = (a: Q, b: Q): Q => {
  if (b.n === 0n) throw new RangeError('division by zero')
  return q(a.n * b.d, a.d * b.n)
}
export const cmp = (a: Q, b: Q): -1 | 0 | 1 => {
  const l = a.n * b.d
  const r = b.n * a.d
  return l < r ? -1 : l > r ? 1 : 0
}
export const isPositive = (a: Q) => a.n > 0n
export const abs = (a: Q): Q => (a.n < 0n ? q(-a.n, a.d) : a)
export const min = (a: Q, b: Q) => (cmp(a, b) <= 0 ? a : b)
export const max = (a: Q, b: Q) => (cmp(a, b) >= 0 ? a : b)

const DECIMAL = /^([+-]?)(\d+)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$|^([+-]?)\.(\d+)(?:[eE]([+-]?\d+))?$/

/**
 * The longest decimal taken, in characters: far more than any measurement needs (a time of day at
 * 1 µs has 15), and short enough that no arithmetic on it can hold the server up.
 */
export const MAX_DECIMAL_CHARS = 40

/** Parses a decimal string ("5.767", "1e-3") exactly. Throws on anything else, or on one too long. */
export function fromDecimal(text: string): Q {
  const tooLong = new RangeError(`a decimal of at most ${MAX_DECIMAL_CHARS} characters`)
  if (text.length > MAX_DECIMAL_CHARS * 2) throw tooLong
  const trimmed = text.trim()
  if (trimmed.length > MAX_DECIMAL_CHARS) throw tooLong
  const m = DECIMAL.exec(trimmed)
  if (!m) throw new SyntaxError(`not a decimal number: ${JSON.stringify(text)}`)
  const sign = (m[1] ?? m[5]) === '-' ? -1n : 1n
  const intPart = m[2] ?? '0'
  const frac = m[3] ?? m[6] ?? ''
  const exp = Number(m[4] ?? m[7] ?? 0)
  if (!Number.isSafeInteger(exp) || Math.abs(exp) > 30) throw new RangeError('exponent out of range')
  let n = BigInt(intPart + frac) * sign
  let d = 10n ** BigInt(frac.length)
  if (exp > 0) n *= 10n ** BigInt(exp)
  if (exp < 0) d *= 10n ** BigInt(-exp)
  return q(n, d)
}

/** A finite JavaScript number taken at its shortest decimal spelling (5.767 is 5767/1000). */
export function fromNumber(x: number): Q {
  if (!Number.isFinite(x)) throw new RangeError('not a finite number')
  return fromDecimal(String(x))
}

export const fromInput = (x: number | string): Q => (typeof x === 'number' ? fromNumber(x) : fromDecimal(x))

export const toNumber = (a: Q): number => {
  const intPart = a.n / a.d
  const rest = a.n - intPart * a.d
  return Number(intPart) + Number((rest * 10n ** 17n) / a.d) / 1e17
}

const pow10 = (k: number) => 10n ** BigInt(k)

/** Scaled integer at k decimals: truncated toward zero, or rounded half away from zero. */
function scaled(a: Q, decimals: number, mode: Rounding): bigint {
  const s = a.n * pow10(decimals)
  const t = s / a.d // bigint division truncates toward zero
  if (mode === 'truncate') return t
  const r = s - t * a.d
  const twice = (r < 0n ? -r : r) * 2n
  if (twice >= a.d) return a.n < 0n ? t - 1n : t + 1n
  return t
}

export function roundTo(a: Q, decimals: number, mode: Rounding): Q {
  return q(scaled(a, decimals, mode), pow10(decimals))
}

/** Largest multiple of 10^-k not above a. */
export function floorTo(a: Q, decimals: number): Q {
  const s = a.n * pow10(decimals)
  let f = s / a.d
  if (s < 0n && f * a.d !== s) f -= 1n
  return q(f, pow10(decimals))
}

/** Smallest multiple of 10^-k not below a. */
export function ceilTo(a: Q, decimals: number): Q {
  const f = floorTo(a, decimals)
  return cmp(f, a) === 0 ? f : add(f, q(1n, pow10(decimals)))
}

/** The published figure: k decimals, truncated or rounded once. */
export function toFixed(a: Q, decimals: number, mode: Rounding = 'truncate'): string {
  const v = scaled(a, decimals, mode)
  const neg = v < 0n
  const digits = (neg ? -v : v).toString().padStart(decimals + 1, '0')
  const head = digits.slice(0, digits.length - decimals)
  const tail = decimals > 0 ? '.' + digits.slice(digits.length - decimals) : ''
  return (neg && v !== 0n ? '-' : '') + head + tail
}

/** Decimal places needed to write a decimal string's value (for "5.7670" that is 4). */
export function decimalsOf(text: string | number): number {
  const s = String(text).trim()
  const m = /\.(\d+)/.exec(s)
  const e = /[eE]([+-]?\d+)$/.exec(s)
  const frac = m?.[1]?.length ?? 0
  return Math.max(0, frac - Number(e?.[1] ?? 0))
}

/**
 * The exact decimal spelling of a, with no trailing zeros, or null when it needs more than `maxDecimals`
 * places (a third, or a product of too many decimals).
 */
export function toExactDecimal(a: Q, maxDecimals: number): string | null {
  for (let k = 0; k <= maxDecimals; k++) {
    if ((a.n * pow10(k)) % a.d === 0n) return toFixed(a, k)
  }
  return null
}
