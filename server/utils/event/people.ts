import { and, eq, sql } from 'drizzle-orm'
import type { EventRole } from '#shared/constants'
import { roleLabels } from '#shared/schemas/events'

interface Invitation {
  eventId: number
  email: string
  name: string
  role: EventRole
  teamName?: string
  invitedBy: number | null
}

/**
 * Gives a person a role at an event, creating the account if it is new, and e-mails them: an
 * invitation link to set a password when they have none yet, else a note of the new role.
 */
export async function invitePerson(inv: Invitation) {
  const db = useDb()
  const { users, memberships, teams, events } = tables
  const result = await db.transaction(async (tx) => {
    const [event] = await tx.select({ name: events.name }).from(events).where(eq(events.id, inv.eventId))
    if (!event) throw notFound('No such event')
    await tx.insert(users).values({ email: inv.email, name: inv.name }).onConflictDoNothing()
    const [user] = await tx.select().from(users).where(eq(users.email, inv.email))
    let teamId: number | null = null
    if (inv.role === 'team' && inv.teamName) {
      await tx.insert(teams).values({ eventId: inv.eventId, name: inv.teamName }).onConflictDoNothing()
      const [team] = await tx
        .select({ id: teams.id })
        .from(teams)
        .where(and(eq(teams.eventId, inv.eventId), eq(teams.name, inv.teamName)))
      teamId = team!.id
    }
    const inserted = await tx
      .insert(memberships)
      .values({ eventId: inv.eventId, userId: user!.id, role: inv.role, teamId, invitedBy: inv.invitedBy })
      .onConflictDoNothing()
      .returning({ id: memberships.id })
    if (!inserted.length) {
      throw createError({
        statusCode: 409,
        statusMessage: `${inv.email} already holds the role of ${inv.role} at this event`,
      })
    }
    return { user: user!, membershipId: inserted[0]!.id, eventName: event.name }
  })

  const role = roleLabels[inv.role].toLowerCase()
  if (!result.user.passwordHash) {
    const token = await issueToken(result.user.id, 'invite')
    await queueMail([{
      to: inv.email,
      subject: `Trapline: you are invited as ${role} at ${result.eventName}`,
      text:
        `Hello ${result.user.name},\n\nYou have been invited to ${result.eventName} on Trapline as ${role}.\n`
        + `Set your password with this link (valid for 7 days, usable once):\n\n${linkFor(token)}\n`,
    }], { wait: false })
  }
  else {
    await queueMail([{
      to: inv.email,
      subject: `Trapline: you are now ${role} at ${result.eventName}`,
      text: `Hello ${result.user.name},\n\nYou now hold the role of ${role} at ${result.eventName} on Trapline. Sign `
        + `in as usual to see what is next.\n`,
    }], { wait: false })
  }
  // The same answer whether or not the address already had an account.
  return { userId: result.user.id, membershipId: result.membershipId }
}

/**
 * Removes one role of a person at an event: they lose what it gave at once (rights are read on every
 * request). The last organiser is never removed; what the person signed stays signed.
 */
export function removeRole(eventId: number, membershipId: number, byUserId: number) {
  return useDb().transaction(async (tx) => {
    const { memberships } = tables
    await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`memberships:${eventId}`}, 0))`)
    const [m] = await tx.select().from(memberships)
      .where(and(eq(memberships.id, membershipId), eq(memberships.eventId, eventId)))
    if (!m) throw notFound('No such role at this event')
    if (m.role === 'organiser') {
      const organisers = await tx.select({ id: memberships.id }).from(memberships)
        .where(and(eq(memberships.eventId, eventId), eq(memberships.role, 'organiser')))
      if (organisers.length <= 1) {
        throw conflict('The event needs an organiser: invite another before removing this one')
      }
    }
    await tx.delete(memberships).where(eq(memberships.id, membershipId))
    return { removed: membershipId, by: byUserId }
  })
}
