import { and, eq, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import type { EventRole } from '#shared/constants'
import { eventIdParams } from '#shared/schemas/events'
import { idParams } from '#shared/schemas/event-day'

/** Signed in with a session that has not ended, else 401. */
export async function requireUser(event: H3Event) {
  const user = await sessionUser(event)
  if (!user) throw createError({ statusCode: 401, statusMessage: 'Sign in first' })
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
  /** The roles held here that the action allows: what the person acts as. */
  actsAs: EventRole[]
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
    const found = await useDb()
      .select({ id: tables.events.id })
      .from(tables.events)
      .where(eq(tables.events.id, eventId))
    if (found.length) return { user, eventId, roles, teamIds, asAdmin: true, actsAs: roles }
  }
  return gate({ user, eventId, roles, teamIds, asAdmin: false }, allowed, 'No such event')
}

function gate(
  access: Omit<EventAccess, 'actsAs'>,
  allowed: readonly EventRole[] | 'any',
  notFound: string,
): EventAccess {
  if (!access.roles.length) throw createError({ statusCode: 404, statusMessage: notFound })
  if (allowed !== 'any' && !access.roles.some(r => allowed.includes(r))) {
    throw createError({
      statusCode: 403,
      statusMessage: `This needs the role of ${allowed.join(' or ')} at this event`,
    })
  }
  return { ...access, actsAs: allowed === 'any' ? access.roles : access.roles.filter(r => allowed.includes(r)) }
}

/**
 * Whether the person acts here only as a team: every role they hold that the action allows is the
 * team role. Such a person reaches their own team's records only, whatever other roles they hold.
 */
export const actsAsTeamOnly = (access: EventAccess) =>
  !access.asAdmin && access.actsAs.every(r => r === 'team')

const OWNER = {
  run: sql`select event_id from runs where id = `,
  attempt: sql`select event_id from attempts where id = `,
  reading: sql`select r.event_id from readings x join runs r on r.id = x.run_id where x.id = `,
  inspection: sql`select event_id from inspections where id = `,
  statement: sql`select event_id from witness_statements where id = `,
  signature: sql`select event_id from signatures where id = `,
  evidence: sql`select event_id from evidence where id = `,
  dossier: sql`select event_id from dossiers where id = `,
  machine: sql`select t.event_id from machines m join teams t on t.id = m.team_id where m.id = `,
  checklist: sql`select event_id from checklists where id = `,
  entry: sql`select event_id from entries where id = `,
  payment: sql`select event_id from payments where id = `,
  appointment: sql`select event_id from appointments where id = `,
  briefing: sql`select event_id from briefings where id = `,
  protest: sql`select event_id from protests where id = `,
  setAside: sql`select event_id from set_asides where id = `,
  changeRequest: sql`select e.event_id from entry_change_requests c join entries e on e.id = c.entry_id where c.id = `,
} as const

/**
 * The same question for a record that belongs to an event (a run, an attempt, a reading) named by
 * the route's `id`: the user's roles at the record's event, found in one query; none is 404.
 */
export async function requireRoleOn(
  event: H3Event,
  kind: keyof typeof OWNER,
  allowed: readonly EventRole[] | 'any',
): Promise<EventAccess & { recordId: number }> {
  const user = await requireUser(event)
  const { id } = validParams(event, idParams)
  const { rows } = await useDb().execute<{ event_id: number, role: EventRole, team_id: number | null }>(sql`
    select m.event_id, m.role, m.team_id from memberships m
    where m.user_id = ${user.id} and m.event_id = (${OWNER[kind]}${id})`)
  const access = gate(
    {
      user,
      eventId: rows[0]?.event_id ?? 0,
      roles: rows.map(r => r.role),
      teamIds: rows.flatMap(r => (r.team_id ? [r.team_id] : [])),
      asAdmin: false,
    },
    allowed,
    `No such ${kind}`,
  )
  return { ...access, recordId: id }
}
