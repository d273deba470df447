import { and, count, eq, gt, sql } from 'drizzle-orm'

export const LOGIN_WINDOW_MIN = 15
export const LOGIN_MAX_FAILURES = 10

/** After 10 failed sign-ins for one address within 15 minutes, refuse with 429 until they age out. */
export async function assertLoginAllowed(email: string) {
  const { loginAttempts } = tables
  const [row] = await useDb()
    .select({ failures: count(), oldest: sql<string>`min(${loginAttempts.at})` })
    .from(loginAttempts)
    .where(
      and(
        eq(loginAttempts.email, email),
        eq(loginAttempts.succeeded, false),
        gt(loginAttempts.at, sql`now() - make_interval(mins => ${LOGIN_WINDOW_MIN})`),
      ),
    )
  if ((row?.failures ?? 0) >= LOGIN_MAX_FAILURES) {
    const retryS = Math.max(
      1,
      Math.ceil((new Date(row!.oldest).getTime() + LOGIN_WINDOW_MIN * 60_000 - Date.now()) / 1000),
    )
    throw createError({
      statusCode: 429,
      statusMessage: 'Too many failed sign-ins',
      message: `Too many failed sign-ins for this address. Try again in ${Math.ceil(retryS / 60)} min or reset the `
        + `password.`,
      data: { retryAfterS: retryS },
    })
  }
}

export async function recordLoginAttempt(email: string, succeeded: boolean) {
  await useDb().insert(tables.loginAttempts).values({ email, succeeded })
}
