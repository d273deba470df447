import { asc, eq, inArray, sql } from 'drizzle-orm'
import type { User } from '#auth-utils'
import { copyProfile, profiles } from '#shared/rules/profiles'
import type { CreateEventInput, UpdateEventInput } from '#shared/schemas/events'
import type { EventAccess } from '../auth/auth'

export async function membershipsOf(userId: number) {
  const { memberships, events, teams } = tables
  return useDb()
    .select({
      eventId: memberships.eventId,
      eventName: events.name,
      role: memberships.role,
      teamId: memberships.teamId,
      teamName: teams.name,
      startsOn: events.startsOn,
      endsOn: events.endsOn,
    })
    .from(memberships)
    .innerJoin(events, eq(events.id, memberships.eventId))
    .leftJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(events.startsOn), asc(memberships.role))
}

/** Events this person holds a role at; a site administrator sees them all. */
export async function listEventsFor(user: User) {
  const { events, memberships } = tables
  const cols = {
    id: events.id,
    name: events.name,
    venue: events.venue,
    startsOn: events.startsOn,
    endsOn: events.endsOn,
    profileId: events.profileId,
  }
  const db = useDb()
  if (user.isAdmin) {
    return db
      .select({
        ...cols,
        organisers: sql<number>`(select count(*)::int from ${memberships} m where m.event_id = ${events.id} and
          m.role = 'organiser')`,
      })
      .from(events)
      .orderBy(asc(events.startsOn))
  }
  const mine = db.select({ id: memberships.eventId }).from(memberships).where(eq(memberships.userId, user.id))
  return db.select(cols).from(events).where(inArray(events.id, mine)).orderBy(asc(events.startsOn))
}

export async function createEventWithOrganiser(input: CreateEventInput, adminId: number) {
  const { organiserEmail, organiserName, ...fields } = input
  const [created] = await useDb()
    .insert(tables.events)
    .values({ ...fields, profile: copyProfile(profiles[input.profileId]), createdBy: adminId })
    .returning()
  await invitePerson({
    eventId: created!.id,
    email: organiserEmail,
    name: organiserName,
    role: 'organiser',
    invitedBy: adminId,
  })
  return created!
}

const LICENCE_ROLES = new Set(['organiser', 'scrutineer', 'official'])

/** The event as its members see it: profile, course and traps, teams with machines and riders. */
export async function eventOverview(access: EventAccess) {
  const db = useDb()
  const { events, courses, traps, teams, machines, riders } = tables
  const [ev] = await db.select().from(events).where(eq(events.id, access.eventId))
  const courseRows = await db
    .select()
    .from(courses)
    .where(eq(courses.eventId, access.eventId))
    .orderBy(asc(courses.id))
  const trapRows = courseRows.length
    ? await db
        .select()
        .from(traps)
        .where(
          inArray(
            traps.courseId,
            courseRows.map(c => c.id),
          ),
        )
        .orderBy(asc(traps.positionM))
    : []
  const teamRows = await db.select().from(teams).where(eq(teams.eventId, access.eventId)).orderBy(asc(teams.name))
  const teamIds = teamRows.map(t => t.id)
  const machineRows = teamIds.length
    ? await db.select().from(machines).where(inArray(machines.teamId, teamIds))
    : []
  const riderRows = teamIds.length ? await db.select().from(riders).where(inArray(riders.teamId, teamIds)) : []
  const seesLicences = (teamId: number) =>
    access.asAdmin || access.roles.some(r => LICENCE_ROLES.has(r)) || access.teamIds.includes(teamId)
  return {
    event: ev!,
    myRoles: access.roles,
    myTeamIds: access.teamIds,
    courses: courseRows.map(c => ({ ...c, traps: trapRows.filter(t => t.courseId === c.id) })),
    teams: teamRows.map(t => ({
      ...t,
      machines: machineRows.filter(m => m.teamId === t.id),
      riders: riderRows
        .filter(r => r.teamId === t.id)
        .map(r => (seesLicences(t.id)
          ? r
          : { ...r, licenceNo: null, licenceExpires: null, licenceGrade: null, medicalExpires: null })),
    })),
  }
}

export async function peopleAt(eventId: number) {
  const { memberships, users, teams } = tables
  return useDb()
    .select({
      membershipId: memberships.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      teamName: teams.name,
      accepted: sql<boolean>`${users.passwordHash} is not null`,
      since: memberships.createdAt,
    })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .leftJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.eventId, eventId))
    .orderBy(asc(memberships.role), asc(users.name))
}

/**
 * Changes an event's details. The name and time zone are part of every timing sheet: while one is
 * signed they are not changed (409 naming the signature; reopen the sheet first).
 */
export async function updateEvent(eventId: number, changes: UpdateEventInput) {
  const [current] = await useDb().select().from(tables.events).where(eq(tables.events.id, eventId))
  const startsOn = changes.startsOn ?? current!.startsOn
  const endsOn = changes.endsOn ?? current!.endsOn
  if (endsOn < startsOn) throw fieldInvalid('endsOn', 'must not be before the first day')
  const feedsSheets = (changes.name !== undefined && changes.name !== current!.name)
    || (changes.timeZone !== undefined && changes.timeZone !== current!.timeZone)
  if (feedsSheets) {
    const signed = await signedSheetsOf(eventId)
    if (signed.length) {
      const list = signed.map(x => `attempt #${x.attemptId} (signature #${x.signatureId})`).join(', ')
      const message = `The event's name and time zone are on signed timing sheets: ${list}; reopen them first`
      throw conflict(message, { signed })
    }
  }
  if (!Object.keys(changes).length) return current!
  const [row] = await useDb().update(tables.events).set(changes).where(eq(tables.events.id, eventId)).returning()
  return row!
}

/** The event's time zone: pages show every instant on the event's clock, named. */
export async function eventTimeZone(eventId: number) {
  const [row] = await useDb().select({ timeZone: tables.events.timeZone }).from(tables.events)
    .where(eq(tables.events.id, eventId))
  return row?.timeZone ?? 'UTC'
}
