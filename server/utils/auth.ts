import { and, eq } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { EventRole } from '../database/schema'
import { eventIdParams } from '#shared/schemas/events'

/** Signed in, else 401. */
export async function requireUser(event: H3Event) {
  const { user } = await requireUserSession(event, { statusCode: 401, message: 'Sign in first' })
  return user
}

export async function requireAdmin(event: H3Event) {
  const user = await requireUser(event)
  if (!user.isAdmin) throw createError({ statusCode: 403, statusMessage: 'Only a site administrator may do this' })
  return user
}

export interface EventAccess {
  user: Awaited<ReturnType<typeof requireUser>>
  eventId: number
  roles: EventRole[]
  teamIds: number[]
  asAdmin: boolean
}

/**
 * Does the signed-in user hold one of these roles at the event named by the route's `id`?
 * No role at all there (or no such event) answers 404, so other events stay invisible;
 * another role answers 403. A site administrator passes where `admin` is allowed.
 */
export async function requireEventRole(
  event: H3Event,
  allowed: readonly EventRole[] | 'any',
  options: { admin?: boolean } = {},
): Promise<EventAccess> {
  const user = await requireUser(event)
  const { id: eventId } = validParams(event, eventIdParams)
  const rows = await useDb()
    .select({ role: tables.memberships.role, teamId: tables.memberships.teamId })
    .from(tables.memberships)
    .where(and(eq(tables.memberships.eventId, eventId), eq(tables.memberships.userId, user.id)))
  const roles = rows.map(r => r.role)
  const teamIds = rows.flatMap(r => (r.teamId ? [r.teamId] : []))
  if (options.admin && user.isAdmin) {
    const found = await useDb().select({ id: tables.events.id }).from(tables.events).where(eq(tables.events.id, eventId))
    if (found.length) return { user, eventId, roles, teamIds, asAdmin: true }
  }
  if (!roles.length) throw createError({ statusCode: 404, statusMessage: 'No such event' })
  if (allowed !== 'any' && !roles.some(r => allowed.includes(r))) {
    throw createError({ statusCode: 403, statusMessage: `This needs the role of ${allowed.join(' or ')} at this event` })
  }
  return { user, eventId, roles, teamIds, asAdmin: false }
}
