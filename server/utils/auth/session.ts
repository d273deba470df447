import { createHash, randomBytes } from 'node:crypto'
import { and, eq, isNull, sql } from 'drizzle-orm'
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
  // The session before this one on the same browser ends: a sign-in replaces it.
  await endThisSession(event)
  const sid = randomBytes(24).toString('base64url')
  await useDb().insert(tables.sessions).values({ idSha256: sidDigest(sid), userId: user.id })
  await replaceUserSession(
    event,
    { user: sessionUser, loggedInAt: new Date().toISOString(), version: user.sessionVersion, sid },
    cookieFor(event),
  )
  return sessionUser
}

const sidDigest = (sid: string) => createHash('sha256').update(sid).digest('hex')

/** Ends the session this request carries on the server, if it names one. */
async function endThisSession(event: H3Event) {
  const { sid } = await getUserSession(event)
  if (!sid) return
  await useDb().update(tables.sessions).set({ endedAt: new Date() })
    .where(and(eq(tables.sessions.idSha256, sidDigest(sid)), isNull(tables.sessions.endedAt)))
}

/** Signing out ends the session on the server, then clears the cookie: the same cookie is refused after. */
export async function signOut(event: H3Event) {
  await endThisSession(event)
  await clearUserSession(event, cookieFor(event))
}

/**
 * The person behind the session, read from the database on every request: a session whose version
 * is older than the person's (a new password, "sign out everywhere") has ended, and rights such as
 * the administrator's come from the database, never from the cookie. Null when there is none.
 */
export async function sessionUser(event: H3Event): Promise<User | null> {
  const session = await getUserSession(event)
  const row = await standingPerson(session)
  if (!row) {
    if (session.user) await clearUserSession(event, cookieFor(event))
    return null
  }
  // For the request log: who made the request, by id only.
  event.context.userId = row.id
  return { id: row.id, email: row.email, name: row.name, isAdmin: row.isAdmin }
}

/**
 * Whether the session a long-lived answer (the live stream) began with still stands, and the person still holds a
 * role at the event (or is the site's administrator): checked again every few seconds while it is open.
 */
export async function sessionStillHolds(event: H3Event, eventId: number) {
  const row = await standingPerson(await getUserSession(event))
  if (!row) return false
  if (row.isAdmin) return true
  const [role] = await useDb().select({ id: tables.memberships.id }).from(tables.memberships)
    .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.userId, row.id))).limit(1)
  return !!role
}

/**
 * The person behind a session, in one query with the session as the server knows it; null when there is no session,
 * or it ended, was never known, or is of an older version than the person's (a new password, "sign out everywhere").
 */
async function standingPerson(session: Awaited<ReturnType<typeof getUserSession>>) {
  if (!session.user) return null
  const [found] = await useDb().select({ row: tables.users, endedAt: tables.sessions.endedAt })
    .from(tables.users)
    .innerJoin(tables.sessions, and(eq(tables.sessions.userId, tables.users.id),
      eq(tables.sessions.idSha256, sidDigest(session.sid ?? ''))))
    .where(eq(tables.users.id, session.user.id))
  if (!found || found.endedAt || found.row.sessionVersion !== (session.version ?? -1)) return null
  return found.row
}

/** Ends every session of a person; returns the row with the new version. */
export async function endSessions(userId: number, db: Tx | Db = useDb()) {
  await db.update(tables.sessions).set({ endedAt: new Date() })
    .where(and(eq(tables.sessions.userId, userId), isNull(tables.sessions.endedAt)))
  const [row] = await db.update(tables.users)
    .set({ sessionVersion: sql`${tables.users.sessionVersion} + 1` })
    .where(eq(tables.users.id, userId))
    .returning()
  return row!
}
