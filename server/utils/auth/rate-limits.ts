import type { H3Event } from 'h3'
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible'

/**
 * Rate limits counted atomically in PostgreSQL (rate-limiter-flexible's PostgreSQL store, table
 * `rate_limits`): every app server shares the counts, and a burst of parallel requests counts as that
 * many. Each limit: how many, over how many seconds, and how long a key that passed it waits.
 */
const LIMITS = {
  // Guesses at one address from one client: the attacker's client is stopped, not the person.
  signInByAddressAndClient: { points: 10, duration: 15 * 60, block: 15 * 60 },
  // Guesses at one address from anywhere: many clients slow down, a real person waits minutes at most.
  signInByAddress: { points: 50, duration: 60 * 60, block: 5 * 60 },
  signInByClient: { points: 200, duration: 24 * 3600, block: 15 * 60 },
  resetByAddress: { points: 5, duration: 3600, block: 0 },
  resetByClient: { points: 30, duration: 3600, block: 0 },
  tokenByClient: { points: 30, duration: 15 * 60, block: 15 * 60 },
  verifyByClient: { points: 60, duration: 60, block: 60 },
} as const
export type LimitName = keyof typeof LIMITS

const limiters = new Map<LimitName, RateLimiterPostgres>()
function limiter(name: LimitName) {
  let l = limiters.get(name)
  if (!l) {
    const { points, duration, block } = LIMITS[name]
    l = new RateLimiterPostgres({
      storeClient: usePool(),
      storeType: 'pool',
      tableName: 'rate_limits',
      tableCreated: true, // made by a migration; the app's database role creates nothing
      clearExpiredByTimeout: true, // expired counts are removed every few minutes
      keyPrefix: name,
      points,
      duration,
      blockDuration: block,
    })
    limiters.set(name, l)
  }
  return l
}

/**
 * The client's address as the socket gives it; a forwarded header counts only behind a proxy the
 * operator declares (NUXT_TRUST_PROXY=true), so a client cannot pick its own key.
 */
export function clientAddress(event: H3Event) {
  const trust = String(useRuntimeConfig().trustProxy) === 'true'
  return getRequestIP(event, { xForwardedFor: trust }) ?? 'unknown'
}

/** A key of fixed length whatever the address: its SHA-256. */
const keyOf = (key: string) => sha256(key)

/** Counts one against each named limit; 429 with the wait when any is passed. */
export async function spend(...uses: [LimitName, string][]) {
  for (const [name, key] of uses) {
    try {
      await limiter(name).consume(keyOf(key))
    }
    catch (e) {
      if (!(e instanceof RateLimiterRes)) throw e
      const retryAfterS = Math.max(1, Math.ceil(e.msBeforeNext / 1000))
      throw createError({
        statusCode: 429,
        statusMessage: 'Too many attempts',
        message: `Too many attempts; try again in ${Math.ceil(retryAfterS / 60)} min`
          + (name.startsWith('signIn') ? ' or reset the password.' : '.'),
        data: { retryAfterS },
      })
    }
  }
}

/** Forgets the count of a key (a successful sign-in clears its guesses from that client). */
export async function forgive(name: LimitName, key: string) {
  await limiter(name).delete(keyOf(key))
}

/** Gives back what an attempt spent, when it succeeded: only failures use up a limit. */
export async function refund(...uses: [LimitName, string][]) {
  for (const [name, key] of uses) await limiter(name).reward(keyOf(key), 1)
}
