import { eq, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { User } from '#auth-utils'

/** The cookie is Secure when the request came over https (directly or through a proxy). */
const cookieFor = (event: H3Event) => ({
  cookie: { secure: getRequestProtocol(event, { xForwardedProto: true }) === 'https' },
})

type UserRow = typeof tables.users.$inferSelect

/** Starts a fresh session for a person: a new sealed cookie of their current session version. */
export async function signIn(
  event: H3Event,
  user: Pick<UserRow, 'id' | 'email' | 'name' | 'isAdmin' | 'sessionVersion'>,
): Promise<User> {
  const sessionUser = { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin }
  await replaceUserSession(
    event,
    { user: sessionUser, loggedInAt: new Date().toISOString(), version: user.sessionVersion },
    cookieFor(event),
  )
  return sessionUser
}

export async function signOut(event: H3Event) {
  await clearUserSession(event, cookieFor(event))
}

/**
 * The person behind the session, read from the database on every request: a session whose version
 * is older than the person's (a new password, "sign out everywhere") has ended, and rights such as
 * the administrator's come from the database, never from the cookie. Null when there is none.
 */
export async function sessionUser(event: H3Event): Promise<User | null> {
  const session = await getUserSession(event)
  if (!session.user) return null
  const [row] = await useDb().select().from(tables.users).where(eq(tables.users.id, session.user.id))
  if (!row || row.sessionVersion !== (session.version ?? -1)) {
    await signOut(event)
    return null
  }
  // For the request log: who made the request, by id only.
  event.context.userId = row.id
  return { id: row.id, email: row.email, name: row.name, isAdmin: row.isAdmin }
}

/** Ends every session of a person; returns the row with the new version. */
export async function endSessions(userId: number, db: Tx | Db = useDb()) {
  const [row] = await db.update(tables.users)
    .set({ sessionVersion: sql`${tables.users.sessionVersion} + 1` })
    .where(eq(tables.users.id, userId))
    .returning()
  return row!
}
