/**
 * Canonical JSON: object keys sorted, no spaces, bigint as a decimal string; the same content always
 * gives the same bytes, so its SHA-256 identifies it.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'bigint') return JSON.stringify(value.toString())
    if (typeof value === 'number' && !Number.isFinite(value))
      throw new TypeError('non-finite number in canonical JSON')
    return JSON.stringify(value ?? null)
  }
  if (value instanceof Date) return JSON.stringify(value.toISOString())
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`
}
