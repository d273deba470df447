import type { H3Event } from 'h3'
import type { User } from '#auth-utils'

/** The cookie is Secure when the request came over https (directly or through a proxy). */
const cookieFor = (event: H3Event) => ({
  cookie: { secure: getRequestProtocol(event, { xForwardedProto: true }) === 'https' },
})

/** Starts a fresh session for a person: a new sealed cookie, nothing carried over. */
export async function signIn(
  event: H3Event,
  user: { id: number, email: string, name: string, isAdmin: boolean },
): Promise<User> {
  const sessionUser = { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin }
  await replaceUserSession(event, { user: sessionUser, loggedInAt: new Date().toISOString() }, cookieFor(event))
  return sessionUser
}

export async function signOut(event: H3Event) {
  await clearUserSession(event, cookieFor(event))
}
