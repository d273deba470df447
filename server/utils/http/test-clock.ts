import type { H3Event } from 'h3'

/**
 * The instant a test asks the server to judge by (the `x-trapline-now` header, ISO 8601), honoured only by a test
 * server: a protest period of 30 minutes is not waited out in a test. Undefined otherwise, and always in production.
 */
export function testClock(event: H3Event): Date | undefined {
  if (!useRuntimeConfig(event).testServer) return undefined
  const at = getHeader(event, 'x-trapline-now')
  const ms = at ? Date.parse(at) : Number.NaN
  return Number.isFinite(ms) ? new Date(ms) : undefined
}
